"""calcreport's tests, one folder a stage of the pipeline."""
