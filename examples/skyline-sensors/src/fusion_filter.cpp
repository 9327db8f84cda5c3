// SPDX-License-Identifier: MIT
// Demo code (invented): predict/update steps of the altitude filter.
#include "skyline/fusion_filter.hpp"

namespace skyline {

FusionFilter::FusionFilter(double process_noise, double sensor_noise)
    : m_process_noise(process_noise), m_sensor_noise(sensor_noise) {}

void FusionFilter::predict(double vertical_accel, double dt) {
    m_altitude += m_velocity * dt + 0.5 * vertical_accel * dt * dt;
    m_velocity += vertical_accel * dt;
    m_variance += m_process_noise * dt;
}

void FusionFilter::update(double baro_altitude) {
    const double gain = m_variance / (m_variance + m_sensor_noise);
    m_altitude += gain * (baro_altitude - m_altitude);
    m_variance *= (1.0 - gain);
}

} // namespace skyline
