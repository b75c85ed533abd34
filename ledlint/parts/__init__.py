"""What each part and net is on an LED board, and their electrical parameters with their origin."""
