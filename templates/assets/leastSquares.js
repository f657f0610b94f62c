// Ordinary least squares of y on x and Pearson's correlation coefficient r,
// for the relation page. With x̄, ȳ the means, Sxx = Σ(x−x̄)², Syy = Σ(y−ȳ)²,
// Sxy = Σ(x−x̄)(y−ȳ): slope b = Sxy/Sxx, intercept a = ȳ − b·x̄,
// r = Sxy/√(Sxx·Syy) (the textbook formulas, e.g. Press et al., Numerical
// Recipes, 3rd ed., §14.5 and §15.2). Deviations from the means are summed,
// not raw sums of squares, so large offsets (temperatures in °C, densities
// of 10¹¹) lose no digits. Returns null with fewer than 3 points or when x
// (or y) does not vary. With 4 or more points it also gives the 95 % interval
// of r from Fisher's z = atanh(r), standard error 1/√(n − 3) (R. A. Fisher,
// Metron 1 (1921) 3–32; any statistics text, e.g. Press et al. §14.5).
//
// space { logX, logY }: the fit is made where the chart draws a straight line.
// A log axis replaces its values by log10 of them before anything is summed,
// so slope, intercept, r and the Fisher-z interval are all of the same
// transformed values (log–log: log10 y = a + b·log10 x, the power law
// y = 10^a·x^b). Every value on a log axis must be > 0 (else null).
// predict(fit, x) gives the fitted y at x in the plotted units.
(function (root) {
  "use strict";
  function leastSquares(points, space) {
    var logX = !!space?.logX,
      logY = !!space?.logY;
    var n = points.length;
    if (n < 3) return null;
    var xs = [],
      ys = [],
      i;
    for (i = 0; i < n; i++) {
      var x = points[i][0],
        y = points[i][1];
      if ((logX && !(x > 0)) || (logY && !(y > 0))) return null;
      xs.push(logX ? Math.log10(x) : x);
      ys.push(logY ? Math.log10(y) : y);
    }
    var mx = 0,
      my = 0;
    for (i = 0; i < n; i++) {
      mx += xs[i];
      my += ys[i];
    }
    mx /= n;
    my /= n;
    var sxx = 0,
      syy = 0,
      sxy = 0;
    for (i = 0; i < n; i++) {
      var dx = xs[i] - mx,
        dy = ys[i] - my;
      sxx += dx * dx;
      syy += dy * dy;
      sxy += dx * dy;
    }
    if (!(sxx > 0) || !(syy > 0)) return null;
    var slope = sxy / sxx;
    var r = Math.max(-1, Math.min(1, sxy / Math.sqrt(sxx * syy)));
    var out = { n: n, slope: slope, intercept: my - slope * mx, r: r, rLow: null, rHigh: null, logX: logX, logY: logY };
    if (n >= 4 && Math.abs(r) < 1) {
      var z = 0.5 * Math.log((1 + r) / (1 - r)),
        half = 1.959964 / Math.sqrt(n - 3);
      out.rLow = Math.tanh(z - half);
      out.rHigh = Math.tanh(z + half);
    }
    return out;
  }
  leastSquares.predict = function (fit, x) {
    var u = fit.intercept + fit.slope * (fit.logX ? Math.log10(x) : x);
    return fit.logY ? Math.pow(10, u) : u;
  };
  root.waferbookLeastSquares = leastSquares;
})(typeof window !== "undefined" ? window : globalThis);
