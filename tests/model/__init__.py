"""Reading the input: quantities, the loader's messages, curve files, corrupted inputs."""
