"""Results: verdicts, the precision numbers carry, a circuit's result and the lean table of many."""
