"""spanfleet: live-load envelopes of a vehicle fleet over an inventory of girder lines."""

__version__ = "0.1.0"
