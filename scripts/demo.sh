#!/usr/bin/env bash
# The main job on the bundled demo (a): the test-bay talkback link, first with
# normal speech at 30 cm, then with a shout at 10 cm.
set -euo pipefail
cd "$(dirname "$0")/.."
echo "== Demo (a), normal speech at 30 cm =="
node bin/glowtalk.mjs render samples/demo-bay/scenario.json --out out/demo-bay/normal-30cm --effort normal --distance 0.3
echo
echo "== Demo (a), shouting at 10 cm =="
node bin/glowtalk.mjs render samples/demo-bay/scenario.json --out out/demo-bay/shout-10cm --effort shout --distance 0.1
echo
echo "Listen to out/demo-bay/*/far-end.wav against out/demo-bay/*/source.wav (start quietly: see the caution in README.md)."
