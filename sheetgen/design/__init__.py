"""Design: Job → Design. The only room that knows both the job and the engine; it writes no text."""
