// SPDX-License-Identifier: MIT
// Demo code (invented): ring buffer for the weather-station sample queue.
#include "skyline/ring_buffer.hpp"

namespace skyline {

RingBuffer::RingBuffer(std::size_t capacity)
    : m_data(new Sample[capacity]), m_capacity(capacity) {}

RingBuffer::~RingBuffer() { delete[] m_data; }

bool RingBuffer::push(const Sample& sample) {
    if (m_count == m_capacity) {
        return false;
    }
    m_data[(m_head + m_count) % m_capacity] = sample;
    ++m_count;
    return true;
}

bool RingBuffer::pop(Sample& out) {
    if (m_count == 0) {
        return false;
    }
    out = m_data[m_head];
    m_head = (m_head + 1) % m_capacity;
    --m_count;
    return true;
}

std::size_t RingBuffer::size() const { return m_count; }

float RingBuffer::mean() const {
    if (m_count == 0) {
        return 0.0f;
    }
    float sum = 0.0f;
    for (std::size_t i = 0; i < m_count; ++i) {
        sum += m_data[(m_head + i) % m_capacity].value;
    }
    return sum / static_cast<float>(m_count);
}

} // namespace skyline
