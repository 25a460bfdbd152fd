// Empty script: measures node + tsx start-up for the benchmark.
