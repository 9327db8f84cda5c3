#!/usr/bin/env bash
# SPDX-License-Identifier: MIT
# Build the demo repository (invented: the "skyline-sensors" firmware library and the Java
# ground-station service that decodes its telemetry) in DIR: a main branch with both and its
# .tollgate.yaml, then three pull-request branches:
#   filter-outliers  bloats FusionFilter::update with outlier handling (the policy blocks it)
#   crc-simplify     folds the CRC's inner if/else into one expression (the policy passes it)
#   decoder-resync   writes frame resynchronisation into FrameDecoder.decode (Java; blocked)
# Usage: make_demo_repo.sh DIR   (DIR must not exist or be empty)
set -euo pipefail

if [ $# -ne 1 ]; then
    echo "usage: make_demo_repo.sh DIR" >&2
    exit 2
fi
dir=$1
sources="$(cd "$(dirname "$0")" && pwd)/skyline-sensors"
if [ -e "$dir" ] && [ -n "$(ls -A "$dir")" ]; then
    echo "make_demo_repo: error: \"$dir\" is not empty (give a new folder)" >&2
    exit 2
fi
mkdir -p "$dir"
cd "$dir"

# Fixed identity and dates: the same script makes the same commit ids everywhere.
export GIT_AUTHOR_NAME="Skyline Firmware" GIT_AUTHOR_EMAIL="firmware@skyline.invalid"
export GIT_COMMITTER_NAME="$GIT_AUTHOR_NAME" GIT_COMMITTER_EMAIL="$GIT_AUTHOR_EMAIL"
commit() {
    export GIT_AUTHOR_DATE="2026-03-0$1T09:00:00Z" GIT_COMMITTER_DATE="2026-03-0$1T09:00:00Z"
    git add -A
    git -c commit.gpgsign=false commit -q -m "$2"
}

git init -q -b main .
cp -R "$sources/include" "$sources/src" "$sources/ground" .
cat > .tollgate.yaml <<'EOF'
# The skyline-sensors team's gate (demo): changed functions may not grow much harder to read.
tollgate-policy: 1
judge-with: base            # the target branch's policy judges each pull request

noise-floor:
  volume: 60                # one-line helpers are left alone

rules:
  - id: effort-growth       # a changed function's effort may grow by 50% at most
    kind: growth
    measure: effort
    max-increase-percent: 50
    level: blocking

  - id: difficulty-ceiling  # a touched function harder than this is pointed out
    kind: ceiling
    measure: difficulty
    ceiling: 40
    level: warning

paths:
  include: ["src/**", "include/**", "ground/**"]   # C/C++ firmware and the Java ground station
EOF
commit 1 "skyline-sensors: ring buffer, CRC-16, unit conversions, altitude filter, ground decoder"

# Pull request 1: outlier handling written straight into the update step.
git checkout -q -b filter-outliers main
python3 - <<'EOF'
import pathlib
header = pathlib.Path("include/skyline/fusion_filter.hpp")
header.write_text(header.read_text().replace(
    "    double m_sensor_noise;\n",
    "    double m_sensor_noise;\n    int m_rejected_in_row = 0;\n"))
source = pathlib.Path("src/fusion_filter.cpp")
source.write_text(source.read_text().replace(
"""void FusionFilter::update(double baro_altitude) {
    const double gain = m_variance / (m_variance + m_sensor_noise);
    m_altitude += gain * (baro_altitude - m_altitude);
    m_variance *= (1.0 - gain);
}""",
"""void FusionFilter::update(double baro_altitude) {
    double innovation = baro_altitude - m_altitude;
    double noise = m_sensor_noise;
    if (innovation > 3.0 * m_sensor_noise || innovation < -3.0 * m_sensor_noise) {
        if (m_rejected_in_row < 3) {
            m_rejected_in_row = m_rejected_in_row + 1;
            m_variance = m_variance + m_process_noise * 0.5;
            return;
        }
        noise = m_sensor_noise * 4.0;
        m_variance = m_variance + m_process_noise * 10.0;
        if (innovation > 50.0) {
            innovation = 50.0;
        } else if (innovation < -50.0) {
            innovation = -50.0;
        }
    }
    m_rejected_in_row = 0;
    double gain = m_variance / (m_variance + noise);
    if (gain > 0.95) {
        gain = 0.95;
    } else if (gain < 0.01) {
        gain = 0.01;
    }
    m_altitude = m_altitude + gain * innovation;
    m_variance = m_variance * (1.0 - gain);
    if (m_variance < 1e-6) {
        m_variance = 1e-6;
    }
}"""))
EOF
commit 2 "filter: reject barometer outliers, clamp the gain and the variance"

# Pull request 2: the CRC's inner branch becomes one expression.
git checkout -q -b crc-simplify main
python3 - <<'EOF'
import pathlib
source = pathlib.Path("src/crc16.c")
source.write_text(source.read_text().replace(
"""        for (int bit = 0; bit < 8; bit++) {
            if (crc & 0x8000) {
                crc = (uint16_t)((crc << 1) ^ 0x1021);
            } else {
                crc = (uint16_t)(crc << 1);
            }
        }""",
"""        for (int bit = 0; bit < 8; bit++) {
            crc = (uint16_t)((crc << 1) ^ ((crc & 0x8000) ? 0x1021 : 0));
        }"""))
EOF
commit 3 "crc16: one expression for the polynomial step"

# Pull request 3 (Java): resynchronisation on a lost sync byte, written into the decoder.
git checkout -q -b decoder-resync main
python3 - <<'EOF'
import pathlib
source = pathlib.Path("ground/src/com/skyline/ground/FrameDecoder.java")
source.write_text(source.read_text().replace(
"""    public Optional<Sample> decode(byte[] frame) {
        if (frame.length < 4 || (frame[0] & 0xFF) != SYNC) {
            rejected++;
            return Optional.empty();
        }
        int length = frame[1] & 0xFF;""",
"""    public Optional<Sample> decode(byte[] frame) {
        int start = 0;
        while (start < frame.length && (frame[start] & 0xFF) != SYNC) {
            start++;
        }
        if (start > 0) {
            if (start + 4 > frame.length) {
                rejected++;
                return Optional.empty();
            }
            byte[] shifted = new byte[frame.length - start];
            for (int i = 0; i < shifted.length; i++) {
                shifted[i] = frame[start + i];
            }
            frame = shifted;
        }
        if (frame.length < 4 || (frame[0] & 0xFF) != SYNC) {
            rejected++;
            return Optional.empty();
        }
        int length = frame[1] & 0xFF;
        if (2 + length + 2 > frame.length) {
            rejected = rejected + (frame.length > 2 ? 1 : 2);
            return Optional.empty();
        }"""))
EOF
commit 4 "ground: resynchronise on a lost sync byte, reject short frames"

git checkout -q main
echo "make_demo_repo: built $(pwd): main, filter-outliers (blocked), crc-simplify (passes)," \
    "decoder-resync (blocked)" >&2
