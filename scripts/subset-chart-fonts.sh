#!/bin/sh
# Regenerates the chart fonts in api/features/campaigns/fonts/ from the dejavu-fonts-ttf package:
# DejaVu Sans and DejaVu Sans Bold cut down to the characters the report's charts can print
# (Basic Latin, Latin-1, Latin Extended-A, Greek, general punctuation, super- and subscripts,
# letterlike symbols, arrows, mathematical operators), glyph outlines and layout tables unchanged.
# The charts' text is all the app's own (titles, axis labels, legends, constraint names); user
# text (the PDF summary) keeps the whole fonts. Needs fontTools (Debian: python3-fonttools).
set -eu
cd "$(dirname "$0")/.."
out=api/features/campaigns/fonts
src=node_modules/dejavu-fonts-ttf/ttf
for face in DejaVuSans DejaVuSans-Bold; do
  "${PYTHON:-/usr/bin/python3}" -m fontTools.subset "$src/$face.ttf" \
    --unicodes='U+0020-007E,U+00A0-017F,U+0370-03FF,U+2000-206F,U+2070-209F,U+2100-214F,U+2190-21FF,U+2200-22FF' \
    --layout-features='*' --drop-tables+=FFTM --output-file="$out/$face-charts.ttf"
done
cp node_modules/dejavu-fonts-ttf/LICENSE "$out/LICENSE"
