"""The PDF report and its charts, read as a reviewer would."""
