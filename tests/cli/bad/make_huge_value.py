# Writes a copy of a scenario whose grid.cells is a 10 MB word (the bad-input catalogue's
# huge-value case): make_huge_value.py SCENARIO OUT
import re
import sys

text = open(sys.argv[1]).read()
open(sys.argv[2], "w").write(re.sub(r"(?m)^  cells: .*", "  cells: " + "x" * 10**7, text, count=1))
