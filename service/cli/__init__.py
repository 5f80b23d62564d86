"""The command line: schedules of circuits and installation files in, results, CSV and reports out
(``python -m service check FILE``). It reads files, not requests: it shares the contract, never the HTTP layer."""
