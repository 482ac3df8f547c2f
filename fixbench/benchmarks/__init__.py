"""The benchmark harnesses behind `fixbench benchmark engine|store|ui`: they build what is
measured (simulated units, a filled temporary shop, a window offscreen), read the clock and print
the figures the project is held to. Nothing below this package reads a clock for a benchmark."""
