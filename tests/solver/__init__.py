"""The solve stage end to end: cases, states, energy, route and surge."""
