"""LED circuits: the connectivity graph, series topology, and one module per circuit kind."""
