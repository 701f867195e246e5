"""The command line and the trace tools (build, check, recheck, diff), packaging and the
golden outputs."""
