#!/bin/sh
# A headroom trainer in plain shell: predicts the most frequent class of the training rows (ties to
# the first name in sort order) for every test row. Cells are split at commas, so it suits files
# without quoted commas.
set -eu
top=$(awk -F, -v label="$HEADROOM_LABEL" '
  NR == 1 { for (i = 1; i <= NF; i++) if ($i == label) c = i; next }
  { n[$c]++ }
  END { for (k in n) if (n[k] > best || (n[k] == best && k < top)) { best = n[k]; top = k }; print top }
' "$HEADROOM_TRAIN")
awk -v top="$top" 'NR == 1 { print "prediction"; next } { print top }' "$HEADROOM_TEST" >"$HEADROOM_PREDICTIONS"
