package settle.reports.html;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;

/**
 * A numeric chart axis, linear or logarithmic (base 10), mapping data values onto [0, 1] with tick
 * positions and labels. Whatever the data, an axis is finite and increasing: non-finite values are ignored, a
 * linear axis stays within ±{@value #LIMIT}, and a log axis within [1e−{@value #MAX_EXPONENT},
 * 1e{@value #MAX_EXPONENT}] and spans at most {@value #MAX_DECADES} decades.
 */
public final class Axis {

    /** Most decades a log axis spans: values further below its top are off the axis and not drawn. */
    public static final int MAX_DECADES = 12;
    /** Largest |exponent| of a log axis's ends. */
    static final int MAX_EXPONENT = 300;
    /** Largest |value| of a linear axis's ends. */
    static final double LIMIT = 1e300;
    /** Most ticks on an axis. */
    private static final int MAX_TICKS = 40;

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
     * @param low smallest data value (NaN or infinite when none: the axis is then [0, 1])
     * @param high largest data value
     * @param label the axis title with its unit
     * @return a linear axis covering [low, high] with a little margin, widened when empty or degenerate, within
     *     ±{@value #LIMIT}
     */
    public static Axis linear(double low, double high, String label) {
        if (!Double.isFinite(low) || !Double.isFinite(high) || high < low) {
            low = 0;
            high = 1;
        }
        low = Math.max(-LIMIT, low);
        high = Math.min(LIMIT, high);
        double scale = Math.max(Math.abs(low), Math.abs(high));
        if (high - low <= 1e-9 * scale || high - low < Double.MIN_NORMAL) {
            double pad = scale == 0 ? 1 : scale * 0.1;
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
     * @param low smallest positive data value (NaN when none)
     * @param high largest data value
     * @param label the axis title with its unit
     * @return a log axis covering [low, high] with a little margin; a range wider than {@value #MAX_DECADES}
     *     decades keeps its top {@value #MAX_DECADES} (smaller values fall off the axis)
     */
    public static Axis log(double low, double high, String label) {
        return log(low, high, Double.NaN, Double.NaN, label);
    }

    /**
     * A log axis chosen from the measured data first: it covers [low, high] (its top {@value #MAX_DECADES} decades
     * when wider), then widens towards [otherLow, otherHigh] (a prediction, say) as far as {@value #MAX_DECADES}
     * decades in all allow. Values off the resulting axis are not drawn; {@link #contains} tells which.
     *
     * @param low smallest positive measured value (NaN when none)
     * @param high largest measured value
     * @param otherLow smallest positive other value (NaN when none)
     * @param otherHigh largest other value
     * @param label the axis title with its unit
     * @return the axis
     */
    public static Axis log(double low, double high, double otherLow, double otherHigh, String label) {
        double lo = usable(low) ? Math.log10(low) : Double.NaN;
        double hi = usable(high) ? Math.log10(high) : Double.NaN;
        double otherLo = usable(otherLow) ? Math.log10(otherLow) : Double.NaN;
        double otherHi = usable(otherHigh) ? Math.log10(otherHigh) : Double.NaN;
        if (!(lo <= hi)) {
            lo = otherLo;
            hi = otherHi;
            otherLo = Double.NaN;
            otherHi = Double.NaN;
        }
        if (!(lo <= hi)) {
            lo = -1;
            hi = 0;
        }
        lo = Math.max(lo, hi - MAX_DECADES);
        if (otherHi > hi) {
            hi = Math.min(otherHi, lo + MAX_DECADES);
        }
        if (otherLo < lo) {
            lo = Math.max(otherLo, hi - MAX_DECADES);
        }
        if (hi - lo < 1e-9) {
            lo -= Math.log10(2);
            hi += Math.log10(2);
        }
        double pad = (hi - lo) * 0.04;
        lo = Math.max(-MAX_EXPONENT, lo - pad);
        hi = Math.min(MAX_EXPONENT, hi + pad);
        if (!(hi > lo)) {
            lo = hi - 1;
        }
        return new Axis(Math.pow(10, lo), Math.pow(10, hi), true, label);
    }

    /** @return true for a positive value whose logarithm is within the exponents a log axis can show */
    private static boolean usable(double v) {
        return v > 0 && Double.isFinite(v) && Math.abs(Math.log10(v)) <= MAX_EXPONENT;
    }

    /** @return true when v lies on the axis (within a part in a million of its span) */
    public boolean contains(double v) {
        double p = map(v);
        return p >= -1e-6 && p <= 1 + 1e-6;
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

    /** @return tick values inside the range (at most {@value #MAX_TICKS}) */
    public double[] ticks() {
        List<Double> t = new ArrayList<>();
        if (log) {
            int lo = (int) Math.ceil(Math.log10(min) - 1e-9);
            int hi = (int) Math.floor(Math.log10(max) + 1e-9);
            int decades = hi - lo + 1;
            double[] mantissas = decades <= 1 ? new double[] {1, 2, 5} : decades <= 3 ? new double[] {1, 3}
                    : new double[] {1};
            int stride = Math.max(1, (decades + 5) / 6);
            for (int e = lo - 1; e <= hi && t.size() < MAX_TICKS; e++) {
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
            double first = Math.ceil(min / step);
            for (int i = 0; i < MAX_TICKS; i++) {
                double v = (first + i) * step;
                if (v > max + step * 1e-9) {
                    break;
                }
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
        // Four significant digits in plain notation (%g would switch to e-notation from 10^4 on: "1.000e+04").
        return new java.math.BigDecimal(v).round(new java.math.MathContext(4)).stripTrailingZeros().toPlainString();
    }
}
