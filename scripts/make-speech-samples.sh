#!/usr/bin/env bash
# Makes glowtalk's bundled speech recordings from our own text with espeak-ng and sox.
#   samples/speech/bay-talkback.wav    operator in the test bay (male voice)
#   samples/speech/bay-talkback-2.wav  control room answering (female voice)
# Both: 48 kHz, mono, 16-bit PCM, leading/trailing silence trimmed then 0.3 s added at each
# end, peak normalised to -6 dBFS. Needs: espeak-ng, sox (Debian: apt-get install espeak-ng sox).
# Run from the repository root: scripts/make-speech-samples.sh
set -euo pipefail

out_dir="samples/speech"
for tool in espeak-ng sox; do
  command -v "$tool" >/dev/null || { echo "make-speech-samples: $tool not found (apt-get install espeak-ng sox)" >&2; exit 1; }
done
mkdir -p "$out_dir"
work="$(mktemp -d)"
trap 'rm -rf "$work"' EXIT

# Text written for glowtalk: a high-voltage test bay talking to its control room.
operator_text="Control, this is bay two. The fence is shut and the earth stick is off. \
Start the ramp when ready. Holding at forty kilovolts, no discharge heard."
control_text="Bay two, control. Ramp starting now, ten kilovolts per minute. \
Call out anything you hear. We stop at fifty, then dump it to earth."

speak() { # voice, words per minute, pitch (0-99), text, output
  local raw="$work/$(basename "$5" .wav)-raw.wav"
  espeak-ng -v "$1" -s "$2" -p "$3" -w "$raw" "$4"
  # -R: repeatable dither; trim silence at both ends, pad 0.3 s, resample, peak-normalise.
  sox -R "$raw" -r 48000 -b 16 -c 1 "$5" \
    silence 1 0.01 0.1% reverse silence 1 0.01 0.1% reverse \
    rate -v 48000 pad 0.3 0.3 norm -6
  echo "$5: $(soxi -D "$5") s"
}

speak en-gb+m3 150 45 "$operator_text" "$out_dir/bay-talkback.wav"
speak en-us+f3 155 55 "$control_text" "$out_dir/bay-talkback-2.wav"
