"""A review of one or more boards: the check run, waivers, baselines, and the diff of two versions."""
