"""Faultpath: earth fault and protective conductor checks for BS 7671 / IEC 60364 circuits."""
