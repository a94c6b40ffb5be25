#include "siftwave/transmission/serial_interval.h"

#include <boost/math/special_functions/gamma.hpp>

#include <algorithm>
#include <charconv>
#include <cmath>
#include <cstdio>
#include <fstream>
#include <sstream>
#include <string_view>

namespace siftwave::transmission {
namespace detail {

constexpr int kMaxDays = 10000;                  // longest serial interval accepted, in days
constexpr std::size_t kMaxFileBytes = 1u << 20;  // a serial-interval file is a few hundred bytes

// The gamma CDF with shape a and scale b at x (0 for x <= 0).
double gammaCdf(double x, double a, double b) {
    return x <= 0.0 ? 0.0 : boost::math::gamma_p(a, x / b);
}

// Cori et al. (2013), Web Appendix 11 (EpiEstim's discr_si), for one day k.
double discretisedGammaWeight(int k, double a, double b) {
    const double kd = k;
    double w = kd * gammaCdf(kd, a, b) + (kd - 2.0) * gammaCdf(kd - 2.0, a, b) -
               2.0 * (kd - 1.0) * gammaCdf(kd - 1.0, a, b);
    w += a * b *
         (2.0 * gammaCdf(kd - 1.0, a + 1.0, b) - gammaCdf(kd - 2.0, a + 1.0, b) -
          gammaCdf(kd, a + 1.0, b));
    return std::max(0.0, w);
}

std::string_view trimmed(std::string_view s) {
    while (!s.empty() && (s.front() == ' ' || s.front() == '\t'))
        s.remove_prefix(1);
    while (!s.empty() && (s.back() == ' ' || s.back() == '\t' || s.back() == '\r'))
        s.remove_suffix(1);
    return s;
}

Error fileError(const std::string& name, std::uint64_t line, std::uint64_t column,
                std::string message) {
    Error e = makeError(ErrorCode::Syntax, std::move(message));
    e.file = name;
    e.line = line;
    e.column = column;
    return e;
}

bool headerIsDayWeight(std::string_view line) {
    const auto comma = line.find(',');
    if (comma == std::string_view::npos)
        return false;
    auto lower = [](std::string_view s) {
        std::string out(s);
        for (char& c : out)
            c = static_cast<char>(std::tolower(static_cast<unsigned char>(c)));
        return out;
    };
    return lower(trimmed(line.substr(0, comma))) == "day" &&
           lower(trimmed(line.substr(comma + 1))) == "weight";
}

// One data row: its day and weight appended to `weights` (gaps filled with 0).
Status readRow(std::string_view line, std::uint64_t lineNo, const std::string& name,
               std::vector<double>& weights) {
    const auto comma = line.find(',');
    if (comma == std::string_view::npos || line.find(',', comma + 1) != std::string_view::npos)
        return fileError(name, lineNo, 1, "a row needs exactly two fields, day and weight");
    const std::string_view dayText = trimmed(line.substr(0, comma));
    const std::string_view weightText = trimmed(line.substr(comma + 1));
    const std::uint64_t weightColumn = comma + 2;
    int day = -1;
    auto [dayEnd, dayErr] = std::from_chars(dayText.data(), dayText.data() + dayText.size(), day);
    if (dayErr != std::errc() || dayEnd != dayText.data() + dayText.size() || day < 0 ||
        day > kMaxDays) {
        return fileError(name, lineNo, 1,
                         "the day must be a whole number from 0 to " + std::to_string(kMaxDays) +
                             ", not '" + std::string(dayText) + "'");
    }
    if (static_cast<std::size_t>(day) < weights.size()) {
        return fileError(
            name, lineNo, 1,
            "day " + std::to_string(day) + " comes after a later or equal day: days must increase");
    }
    double weight = 0.0;
    auto [wEnd, wErr] =
        std::from_chars(weightText.data(), weightText.data() + weightText.size(), weight);
    if (wErr != std::errc() || wEnd != weightText.data() + weightText.size() ||
        !std::isfinite(weight) || weight < 0.0) {
        return fileError(name, lineNo, weightColumn,
                         "the weight must be a number >= 0, not '" + std::string(weightText) + "'");
    }
    if (day == 0 && weight != 0.0) {
        return fileError(name, lineNo, weightColumn,
                         "day 0 must weigh 0: a case does not infect others with onset on its own "
                         "onset day in this method (Cori et al. 2013)");
    }
    weights.resize(static_cast<std::size_t>(day) + 1, 0.0);
    weights.back() = weight;
    return Ok{};
}

}  // namespace detail

double SerialInterval::meanDays() const {
    double m = 0.0;
    for (std::size_t k = 0; k < weights.size(); ++k)
        m += static_cast<double>(k) * weights[k];
    return m * periodDays;
}

double SerialInterval::sdDays() const {
    const double mean = meanDays() / periodDays;
    double v = 0.0;
    for (std::size_t k = 0; k < weights.size(); ++k) {
        const double d = static_cast<double>(k) - mean;
        v += d * d * weights[k];
    }
    return std::sqrt(v) * periodDays;
}

Result<SerialInterval> discretisedGamma(double meanDays, double sdDays) {
    if (!std::isfinite(meanDays) || !std::isfinite(sdDays) || meanDays <= 1.0 || sdDays <= 0.0) {
        return makeError(ErrorCode::Usage,
                         "the serial interval's mean must exceed 1 day and its sd be positive "
                         "(the discretisation of Cori et al. 2013 offsets the gamma by 1 day)");
    }
    const double a = ((meanDays - 1.0) / sdDays) * ((meanDays - 1.0) / sdDays);
    const double b = sdDays * sdDays / (meanDays - 1.0);
    SerialInterval si;
    double total = 0.0;
    for (int k = 0; k <= detail::kMaxDays && total < 1.0 - 1e-12; ++k) {
        si.weights.push_back(detail::discretisedGammaWeight(k, a, b));
        total += si.weights.back();
    }
    char text[128];
    std::snprintf(text, sizeof text, "gamma, mean %g d, sd %g d (discretised, Cori et al. 2013)",
                  meanDays, sdDays);
    si.description = text;
    return si;
}

Result<SerialInterval> parseSerialInterval(const std::string& text, const std::string& name) {
    std::vector<double> weights;
    std::uint64_t lineNo = 0;
    bool header = false;
    std::size_t pos = 0;
    while (pos < text.size()) {
        std::size_t end = text.find('\n', pos);
        if (end == std::string::npos)
            end = text.size();
        const std::string_view line =
            detail::trimmed(std::string_view(text).substr(pos, end - pos));
        pos = end + 1;
        ++lineNo;
        if (line.empty())
            continue;
        if (!header) {
            if (!detail::headerIsDayWeight(line))
                return detail::fileError(name, lineNo, 1, "the first line must be 'day,weight'");
            header = true;
            continue;
        }
        if (auto s = detail::readRow(line, lineNo, name, weights); !s)
            return s.error();
    }
    double total = 0.0;
    for (double w : weights)
        total += w;
    if (!header || weights.empty() || std::abs(total - 1.0) > 0.01) {
        char message[160];
        std::snprintf(message, sizeof message, "the weights must sum to 1 (within 0.01), not %.6g",
                      total);
        return detail::fileError(name, lineNo, 0,
                                 weights.empty() ? "the file holds no day,weight rows" : message);
    }
    SerialInterval si;
    si.weights = std::move(weights);
    si.description = "from " + name + " (" + std::to_string(si.weights.size()) + " days)";
    return si;
}

Result<SerialInterval> readSerialIntervalFile(const std::string& path) {
    std::ifstream in(path, std::ios::binary);
    if (!in) {
        Error e = makeError(ErrorCode::Io, "cannot open the serial-interval file");
        e.file = path;
        return e;
    }
    std::string text(detail::kMaxFileBytes + 1, '\0');
    in.read(text.data(), static_cast<std::streamsize>(text.size()));
    text.resize(static_cast<std::size_t>(in.gcount()));
    if (text.size() > detail::kMaxFileBytes) {
        Error e = makeError(ErrorCode::InvalidValue,
                            "the serial-interval file is over 1 MB: not a day,weight table");
        e.file = path;
        return e;
    }
    return parseSerialInterval(text, path);
}

SerialInterval toWeeks(const SerialInterval& daily) {
    SerialInterval weekly;
    weekly.periodDays = 7 * daily.periodDays;
    weekly.weights.assign(daily.weights.size() / 7 + 2, 0.0);
    for (std::size_t d = 0; d < daily.weights.size(); ++d) {
        for (std::size_t u = 0; u < 7; ++u)
            weekly.weights[(u + d) / 7] += daily.weights[d] / 7.0;
    }
    while (weekly.weights.size() > 1 && weekly.weights.back() == 0.0)
        weekly.weights.pop_back();
    weekly.description = daily.description + ", as whole weeks";
    return weekly;
}

}  // namespace siftwave::transmission
