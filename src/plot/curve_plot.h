// SPDX-License-Identifier: Apache-2.0
// The calibration-curve plot: calibrators, fitted function, its confidence band, working range,
// LOD/LOQ and a residual panel of %RE against the acceptance band.
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "fitting/fit.h"
#include "plot/plot.h"

namespace cw::plot {

/// One calibration reading as the plot shows it.
struct CurvePlotPoint {
  double nominal = 0;               ///< nominal concentration, in CurvePlot::unit
  double response = 0;              ///< response (area, height or ratio), as fitted
  std::string level;                ///< level label, e.g. "L3"
  int replicate = 1;                ///< 1-based replicate number within the level
  bool excluded = false;            ///< kept in the record but not fitted
  std::string exclusion_reason;     ///< why it was excluded (listed beside the plot)
  std::optional<double> error_pct;  ///< %RE of the back-calculated value; nullopt when none
  bool within_limits = true;        ///< the %RE is within the limit that applies to the point
};

/// Everything the curve plot shows. The numbers come from the fit and the method; the plot only
/// draws them (except the confidence band, computed from fit.covariance and fit.dof).
struct CurvePlot {
  std::string title;    ///< first line, e.g. "Curve 17 · NITRATE-IC v2 · IC-02"
  std::string analyte;  ///< e.g. "nitrate"
  std::string unit;     ///< concentration unit, e.g. "mg/L"
  std::string response_label = "response";  ///< y-axis name, e.g. "response ratio"
  /// Model, coefficients (y = intercept + slope·x + quadratic·x²), covariance, residual_sd and
  /// dof. The band is t(0.975; dof)·√(gᵀ·Cov·g), g = (1, x, x²); no band when dof < 1.
  fitting::FitResult fit;
  std::vector<CurvePlotPoint> points;
  /// Working range in `unit`; the fitted function is drawn over it (over the nominal
  /// concentrations instead when range_high <= range_low).
  double range_low = 0;
  double range_high = 0;
  std::optional<double> lod;                     ///< limit of detection, in `unit`
  std::optional<double> loq;                     ///< limit of quantitation, in `unit`
  std::optional<double> error_limit_pct;         ///< ± %RE acceptance limit of each level
  std::optional<double> lowest_error_limit_pct;  ///< ± %RE limit of the lowest level, if other
  double r2 = 0;                                 ///< shown as "r² = ..."
  std::string equation;                          ///< shown as given, e.g. "y = 0.0123 + 1.0456·x"
  PlotPage page;
};

/// Half-width of the two-sided 95 % confidence band of the mean response at concentration x:
/// t(0.975; dof)·√(gᵀ·Cov·g) with g = (1, x, x²) and Cov = fit.covariance (zero rows and
/// columns drop the terms a model lacks). 0 when fit.dof < 1.
double mean_response_half_width(const fitting::FitResult& fit, double x);

/// Draws `plot` and writes it to `path` as SVG, PNG or PDF (by extension; see plot.h).
///
/// Upper panel, against nominal concentration: the calibrators (replicate 1 filled circle, 2 open
/// circle, 3 open square, 4 and later open diamond, excluded points a cross), the fitted function
/// over the working range with its 95 % confidence band of the mean response, the working range
/// shaded, LOD and LOQ as labelled vertical lines. Lower panel, one evenly spaced slot per
/// calibration level (labelled with its nominal concentration and level name): the %RE of each
/// point that has one, replicates side by side, against the ± acceptance band and the
/// lowest-level limit; points outside their limit are ringed, values beyond the axis pinned to
/// its edge with an arrowhead. A column to the right holds the legend and the exclusions with
/// their reasons (from the top) and the equation, r² and s(y/x) (at the foot), so no text covers
/// data. Throws ValidationError for an unknown extension, a page smaller than 480 × 360,
/// non-finite numbers, or a file that cannot be written (no file is left behind then).
void render_curve_plot(const CurvePlot& plot, const std::string& path);

}  // namespace cw::plot
