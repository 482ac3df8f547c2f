"""The cold network: what a meter reads between two points of an unplugged, discharged board.

A board is a netlist of parts, each with its pins on named nodes (netlist.py). Each kind of part has
a cold model: the resistors, winding resistances, capacitors and junctions it shows a meter, in any
of its failure modes (part_models.py, junctions.py). The meter is a source with a stated open-circuit
voltage and test current per range (meter.py). A small nonlinear DC solve over the part of the
network that can carry the meter's current (solve.py) gives what the display shows, on every range
and in both probe polarities (readings.py), and how a reading creeps while capacitors charge from
the meter (creep.py). Faults, lifted legs and a board's own part values are changes to the netlist,
so a faulty board's readings come from the same solve.
"""
