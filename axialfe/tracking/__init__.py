"""Tracking: temperature and load-factor sweeps with exact events (``sweep``)."""
