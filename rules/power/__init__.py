"""Power-path rules: connectors and switches between the pack, the controller and the motors."""
