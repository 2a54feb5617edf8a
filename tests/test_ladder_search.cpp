// The bracketing search behind `heatbead preheat`, on tests whose answer is known exactly.
#include "solver/studies/ladder_search.hpp"

#include <catch2/catch.hpp>

#include <cmath>

using namespace heatbead;

TEST_CASE("ladder of candidates", "[search]") {
    const Ladder l{20, 250, 5};
    CHECK(l.size() == 47);
    CHECK(l.at(0) == 20);
    CHECK(l.at(46) == 250);
    const Ladder clipped{20, 252, 5};  // the last rung is clipped to the top
    CHECK(clipped.size() == 48);
    CHECK(clipped.at(47) == 252);
}

TEST_CASE("finds the lowest passing candidate with few evaluations", "[search]") {
    const Ladder l{20, 250, 5};
    for (std::size_t batch : {1, 2, 3}) {
        for (double threshold : {20.0, 21.0, 85.0, 87.5, 245.0, 250.0}) {
            std::size_t calls = 0;
            const auto r = find_lowest_passing(l, batch, [&](const std::vector<double>& c) {
                ++calls;
                CHECK(c.size() <= std::max<std::size_t>(batch, 2));
                std::vector<bool> out;
                for (double t : c) out.push_back(t >= threshold);
                return out;
            });
            REQUIRE(r.lowest_passing);
            // The answer is the first rung at or above the threshold.
            CHECK(l.at(*r.lowest_passing) == std::ceil((threshold - 20) / 5) * 5 + 20);
            CHECK(r.monotone);
            // Bisection over 46 gaps needs ⌈log2 46⌉ = 6 rounds after the two ends; wider batches fewer.
            const double per_round = std::log(static_cast<double>(batch + 1));
            CHECK(static_cast<double>(calls) <= 2 + std::ceil(std::log(46.0) / per_round));
        }
    }
}

TEST_CASE("reports when nothing passes, and when the test is not monotone", "[search]") {
    const Ladder l{0, 100, 10};
    const auto none = find_lowest_passing(l, 2, [](const std::vector<double>& c) { return std::vector<bool>(c.size(), false); });
    CHECK_FALSE(none.lowest_passing);
    CHECK(none.evaluations == 2);
    // Passes at 30 and from 90 on, fails elsewhere: the second round (30 and 70) sees a failure
    // above a pass.
    const auto odd = find_lowest_passing(l, 2, [](const std::vector<double>& c) {
        std::vector<bool> out;
        for (double t : c) out.push_back(t == 30 || t >= 90);
        return out;
    });
    REQUIRE(odd.lowest_passing);
    CHECK_FALSE(odd.monotone);
}
