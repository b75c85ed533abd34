"""Each LED circuit's operating point over tolerance, supply and temperature, and the fixes sized for it."""
