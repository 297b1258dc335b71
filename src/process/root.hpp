// Internal: Brent's method for a bracketed root of a scalar function (Brent 1973,
// "Algorithms for Minimization without Derivatives", ch. 4).
#pragma once

#include <cmath>
#include <functional>
#include <utility>

namespace deltag::process {

struct RootResult {
    double x = 0.0;
    double fx = 0.0;
    int evaluations = 0;
    bool converged = false;
};

// Finds x in [a, b] with f(a), f(b) of opposite signs; stops when |f| <= f_tolerance or the
// bracket is narrower than x_tolerance.
inline RootResult brent(const std::function<double(double)>& f, double a, double b, double fa, double fb,
                        double f_tolerance, double x_tolerance, int max_evaluations = 200) {
    RootResult r;
    if (std::abs(fa) < std::abs(fb)) {
        std::swap(a, b);
        std::swap(fa, fb);
    }
    double c = a, fc = fa, d = b - a, e = d;
    for (int i = 0; i < max_evaluations; ++i) {
        if (std::abs(fb) <= f_tolerance) {
            r = {b, fb, i, true};
            return r;
        }
        if ((fb > 0) == (fc > 0)) {
            c = a;
            fc = fa;
            d = e = b - a;
        }
        if (std::abs(fc) < std::abs(fb)) {
            a = b;
            b = c;
            c = a;
            fa = fb;
            fb = fc;
            fc = fa;
        }
        const double tol = 2.0 * 1e-16 * std::abs(b) + 0.5 * x_tolerance;
        const double m = 0.5 * (c - b);
        if (std::abs(m) <= tol) {
            r = {b, fb, i, std::abs(fb) <= f_tolerance};
            return r;
        }
        if (std::abs(e) >= tol && std::abs(fa) > std::abs(fb)) {
            // Inverse quadratic interpolation or secant.
            double p, q;
            const double s = fb / fa;
            if (a == c) {
                p = 2.0 * m * s;
                q = 1.0 - s;
            } else {
                const double qq = fa / fc, rr = fb / fc;
                p = s * (2.0 * m * qq * (qq - rr) - (b - a) * (rr - 1.0));
                q = (qq - 1.0) * (rr - 1.0) * (s - 1.0);
            }
            if (p > 0) q = -q;
            else p = -p;
            if (2.0 * p < std::min(3.0 * m * q - std::abs(tol * q), std::abs(e * q))) {
                e = d;
                d = p / q;
            } else {
                d = m;
                e = m;
            }
        } else {
            d = m;
            e = m;
        }
        a = b;
        fa = fb;
        b += std::abs(d) > tol ? d : (m > 0 ? tol : -tol);
        fb = f(b);
    }
    r = {b, fb, max_evaluations, std::abs(fb) <= f_tolerance};
    return r;
}

}  // namespace deltag::process
