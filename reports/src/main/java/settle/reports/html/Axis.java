package settle.reports.html;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;

/**
 * A numeric chart axis, linear or logarithmic (base 10), mapping data values onto [0, 1] with tick
 * positions and labels.
 */
public final class Axis {

    private final double min;
    private final double max;
    private final boolean log;
    private final String label;

    private Axis(double min, double max, boolean log, String label) {
        if (!(min < max) || !Double.isFinite(min) || !Double.isFinite(max)) {
            throw new IllegalArgumentException("axis range must be finite and increasing: " + min + ", " + max);
        }
        if (log && !(min > 0)) {
            throw new IllegalArgumentException("a log axis needs positive values: " + min);
        }
        this.min = min;
        this.max = max;
        this.log = log;
        this.label = label;
    }

    /**
     * @param low smallest data value (or NaN when none)
     * @param high largest data value
     * @param label the axis title with its unit
     * @return a linear axis covering [low, high] with a little margin, widened when empty or degenerate
     */
    public static Axis linear(double low, double high, String label) {
        if (!Double.isFinite(low) || !Double.isFinite(high)) {
            low = 0;
            high = 1;
        }
        if (high - low <= 1e-300 * Math.max(1, Math.abs(high))) {
            double pad = low == 0 ? 1 : Math.abs(low) * 0.1;
            low -= pad;
            high += pad;
        }
        double pad = (high - low) * 0.04;
        return new Axis(low - pad, high + pad, false, label);
    }

    /** @return a linear axis from exactly low to high */
    public static Axis fixed(double low, double high, String label) {
        return new Axis(low, high, false, label);
    }

    /**
     * @param low smallest positive data value (or NaN)
     * @param high largest data value
     * @param label the axis title with its unit
     * @return a log axis covering [low, high] with a little margin
     */
    public static Axis log(double low, double high, String label) {
        if (!(low > 0) || !Double.isFinite(low) || !Double.isFinite(high) || high < low) {
            low = 0.1;
            high = 1;
        }
        if (high <= low * (1 + 1e-12)) {
            low /= 2;
            high *= 2;
        }
        double span = Math.log10(high / low) * 0.04;
        return new Axis(low * Math.pow(10, -span), high * Math.pow(10, span), true, label);
    }

    /** @return true for a log axis */
    public boolean isLog() {
        return log;
    }

    /** @return the axis title */
    public String label() {
        return label;
    }

    /** @return the position of v in [0, 1] (outside for values off the axis; NaN for v ≤ 0 on a log axis) */
    public double map(double v) {
        if (log) {
            return v > 0 ? Math.log10(v / min) / Math.log10(max / min) : Double.NaN;
        }
        return (v - min) / (max - min);
    }

    /** @return the smallest value shown */
    public double min() {
        return min;
    }

    /** @return the largest value shown */
    public double max() {
        return max;
    }

    /** @return tick values inside the range */
    public double[] ticks() {
        List<Double> t = new ArrayList<>();
        if (log) {
            int lo = (int) Math.ceil(Math.log10(min) - 1e-9);
            int hi = (int) Math.floor(Math.log10(max) + 1e-9);
            int decades = hi - lo + 1;
            double[] mantissas = decades <= 1 ? new double[] {1, 2, 5} : decades <= 3 ? new double[] {1, 3}
                    : new double[] {1};
            int stride = Math.max(1, (decades + 5) / 6);
            for (int e = lo - 1; e <= hi; e++) {
                if (Math.floorMod(e, stride) != 0) {
                    continue;
                }
                for (double m : mantissas) {
                    double v = m * Math.pow(10, e);
                    if (v >= min && v <= max) {
                        t.add(v);
                    }
                }
            }
        } else {
            double step = niceStep((max - min) / 5);
            for (double v = Math.ceil(min / step) * step; v <= max + step * 1e-9; v += step) {
                t.add(Math.abs(v) < step * 1e-9 ? 0.0 : v);
            }
        }
        double[] out = new double[t.size()];
        for (int i = 0; i < out.length; i++) {
            out[i] = t.get(i);
        }
        return out;
    }

    private static double niceStep(double raw) {
        double e = Math.pow(10, Math.floor(Math.log10(raw)));
        double f = raw / e;
        return (f < 1.5 ? 1 : f < 3.5 ? 2 : f < 7.5 ? 5 : 10) * e;
    }

    /** @return a short label for a tick value */
    public static String format(double v) {
        if (v == 0) {
            return "0";
        }
        double a = Math.abs(v);
        if (a >= 1e5 || a < 1e-3) {
            String s = String.format(Locale.ROOT, "%.0e", v);
            return s.replace("e-0", "e-").replace("e+0", "e").replace("e+", "e");
        }
        String s = String.format(Locale.ROOT, "%.4g", v);
        if (s.contains(".")) {
            s = s.replaceAll("0+$", "").replaceAll("\\.$", "");
        }
        return s;
    }
}
