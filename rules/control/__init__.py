"""Control rules: what the rider commands and what stops the drive when that goes wrong."""
