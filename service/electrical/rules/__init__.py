"""The rules read from data: the disconnection times of Table 41.1 and the requirements beyond the calculations."""
