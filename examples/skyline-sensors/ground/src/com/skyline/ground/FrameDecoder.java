// SPDX-License-Identifier: MIT
// skyline-sensors ground station (invented demo): decodes the telemetry frames the station
// firmware sends over the radio link: sync byte 0xA5, payload length, payload, CRC-16/CCITT.
package com.skyline.ground;

import java.util.Optional;

public final class FrameDecoder {
    private static final int SYNC = 0xA5;
    private int rejected;

    /** One weather sample as the station measured it. */
    public record Sample(long timeMs, double celsius, double hectopascal) {}

    static int crc16(byte[] data, int offset, int length) {
        int crc = 0xFFFF;
        for (int i = offset; i < offset + length; i++) {
            crc ^= (data[i] & 0xFF) << 8;
            for (int bit = 0; bit < 8; bit++) {
                crc = (crc & 0x8000) != 0 ? (crc << 1) ^ 0x1021 : crc << 1;
            }
        }
        return crc & 0xFFFF;
    }

    public Optional<Sample> decode(byte[] frame) {
        if (frame.length < 4 || (frame[0] & 0xFF) != SYNC) {
            rejected++;
            return Optional.empty();
        }
        int length = frame[1] & 0xFF;
        int expected = ((frame[2 + length] & 0xFF) << 8) | (frame[3 + length] & 0xFF);
        if (crc16(frame, 2, length) != expected) {
            rejected++;
            return Optional.empty();
        }
        return Optional.of(toSample(frame, 2));
    }

    static Sample toSample(byte[] frame, int at) {
        long time = ((frame[at] & 0xFFL) << 24) | ((frame[at + 1] & 0xFF) << 16)
                | ((frame[at + 2] & 0xFF) << 8) | (frame[at + 3] & 0xFF);
        double celsius = (short) ((frame[at + 4] << 8) | (frame[at + 5] & 0xFF)) / 100.0;
        double pressure = (((frame[at + 6] & 0xFF) << 8) | (frame[at + 7] & 0xFF)) / 10.0 + 500.0;
        return new Sample(time, celsius, pressure);
    }

    public int rejected() {
        return rejected;
    }
}
