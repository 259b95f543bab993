package settle.reports.text;

import java.util.Locale;

/** Number formats of the report's text and tables. */
public final class Format {

    private Format() {
    }

    /** @return v to three significant digits ("—" for NaN) */
    public static String sig(double v) {
        if (!Double.isFinite(v)) {
            return Double.isNaN(v) ? "—" : v > 0 ? "∞" : "−∞";
        }
        if (v == 0) {
            return "0";
        }
        double a = Math.abs(v);
        String s;
        if (a >= 1e5 || a < 1e-3) {
            s = String.format(Locale.ROOT, "%.2e", v).replace("e-0", "e-").replace("e+0", "e").replace("e+", "e");
        } else {
            // Three significant digits in plain notation (%g would write 1530 as "1.53e+03").
            s = new java.math.BigDecimal(v).round(new java.math.MathContext(3)).stripTrailingZeros().toPlainString();
        }
        return s.replace('-', '−');
    }

    /** @return a % change with a sign and two significant digits, e.g. "−64 %" */
    public static String percent(double v) {
        if (!Double.isFinite(v)) {
            return "—";
        }
        double a = Math.abs(v);
        String s = a >= 10 ? String.format(Locale.ROOT, "%.0f", a) : String.format(Locale.ROOT, "%.2g", a);
        if (s.contains(".")) {
            s = s.replaceAll("0+$", "").replaceAll("\\.$", "");
        }
        if (s.equals("0")) {
            return "0 %";
        }
        return (v < 0 ? "−" : "+") + s + " %";
    }

    /** @return an interval of % changes, e.g. "−70 to −58 %" */
    public static String percentRange(double low, double high) {
        if (!Double.isFinite(low) || !Double.isFinite(high)) {
            return "—";
        }
        return percent(low).replace(" %", "") + " to " + percent(high);
    }

    /** @return a p-value, two significant digits, "&lt; 0.0001" below that */
    public static String p(double p) {
        if (!Double.isFinite(p)) {
            return "—";
        }
        if (p < 1e-4) {
            return "< 0.0001";
        }
        String s = String.format(Locale.ROOT, "%.2g", p);
        return s.contains("e") ? String.format(Locale.ROOT, "%.5f", p) : s;
    }
}
