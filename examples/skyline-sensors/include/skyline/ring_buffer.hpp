// SPDX-License-Identifier: MIT
// Demo code (invented): a fixed-capacity ring buffer for sensor samples.
#pragma once

#include <cstddef>
#include <cstdint>

namespace skyline {

struct Sample {
    std::uint32_t timestamp_ms;
    float value;
};

class RingBuffer {
public:
    explicit RingBuffer(std::size_t capacity);
    ~RingBuffer();

    bool push(const Sample& sample);
    bool pop(Sample& out);
    std::size_t size() const;
    bool empty() const { return m_count == 0; }
    float mean() const;

private:
    Sample* m_data;
    std::size_t m_capacity;
    std::size_t m_head = 0;
    std::size_t m_count = 0;
};

} // namespace skyline
