"""The network: the supply, the tree of boards, each board's loops and fault levels, and the installation's check."""
