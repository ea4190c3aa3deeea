"""Motor rules: the winding's temperature under the load the drive can hold."""
