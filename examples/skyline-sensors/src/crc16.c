/* SPDX-License-Identifier: MIT */
/* Demo code (invented): CRC-16/CCITT over a telemetry frame, bit by bit. */
#include <stddef.h>
#include <stdint.h>

uint16_t skyline_crc16(const uint8_t *data, size_t length) {
    uint16_t crc = 0xFFFF;
    for (size_t i = 0; i < length; i++) {
        crc ^= (uint16_t)(data[i] << 8);
        for (int bit = 0; bit < 8; bit++) {
            if (crc & 0x8000) {
                crc = (uint16_t)((crc << 1) ^ 0x1021);
            } else {
                crc = (uint16_t)(crc << 1);
            }
        }
    }
    return crc;
}

int skyline_frame_ok(const uint8_t *frame, size_t length) {
    if (length < 2) {
        return 0;
    }
    uint16_t expected = (uint16_t)((frame[length - 2] << 8) | frame[length - 1]);
    return skyline_crc16(frame, length - 2) == expected;
}
