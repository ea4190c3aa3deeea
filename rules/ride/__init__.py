"""Ride rules: the vehicle over a whole ride in time: winding heat, energy, range and sag."""
