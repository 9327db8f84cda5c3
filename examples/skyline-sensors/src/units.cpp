// SPDX-License-Identifier: MIT
// Demo code (invented): unit conversions for the station's readings.
#include <string>

namespace skyline::units {

double celsius_to_fahrenheit(double celsius) { return celsius * 9.0 / 5.0 + 32.0; }

double hectopascal_to_inches_hg(double hpa) { return hpa * 0.02953; }

double knots_to_metres_per_second(double knots) { return knots * 0.514444; }

std::string wind_direction(double degrees) {
    static const char* const names[] = {"N", "NE", "E", "SE", "S", "SW", "W", "NW"};
    const int sector = static_cast<int>((degrees + 22.5) / 45.0) % 8;
    return names[sector < 0 ? sector + 8 : sector];
}

} // namespace skyline::units
