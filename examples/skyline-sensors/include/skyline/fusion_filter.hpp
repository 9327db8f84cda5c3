// SPDX-License-Identifier: MIT
// Demo code (invented): a one-dimensional filter fusing a barometer with an accelerometer.
#pragma once

namespace skyline {

class FusionFilter {
public:
    FusionFilter(double process_noise, double sensor_noise);

    void predict(double vertical_accel, double dt);
    void update(double baro_altitude);
    double altitude() const { return m_altitude; }

private:
    double m_altitude = 0.0;
    double m_velocity = 0.0;
    double m_variance = 1.0;
    double m_process_noise;
    double m_sensor_noise;
};

} // namespace skyline
