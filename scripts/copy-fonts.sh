#!/usr/bin/env bash
# Copies the Noto Sans subsets the interface uses (latin for text, greek for Δ, ω, ν) from
# @fontsource/noto-sans into public/fonts, so the app serves its own fonts and asks no other host.
set -euo pipefail
cd "$(dirname "$0")/.."
mkdir -p public/fonts
for subset in latin greek; do
  for weight in 400 500 700; do
    cp "node_modules/@fontsource/noto-sans/files/noto-sans-${subset}-${weight}-normal.woff2" public/fonts/
  done
done
