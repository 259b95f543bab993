package settle.reports.stats;

/**
 * In-place selection of order statistics (quickselect, no allocation). The pivot is the median of three
 * elements at pseudo-random positions (a fixed xorshift sequence, so runs are repeatable): Walsh averages
 * filled row by row are strongly structured, and a fixed-position median of three was ten times slower on
 * them. The value selected does not depend on the pivots.
 */
final class Selection {

    private Selection() {
    }

    /**
     * Rearranges {@code a[0..length)} so that a[k] is the (k+1)-th smallest, everything before it is
     * ≤ a[k] and everything after it is ≥ a[k]. Modified.
     */
    static double select(double[] a, int length, int k) {
        int lo = 0;
        int hi = length - 1;
        long state = 0x9E3779B97F4A7C15L ^ length;
        while (hi > lo) {
            int span = hi - lo + 1;
            state ^= state << 13;
            state ^= state >>> 7;
            state ^= state << 17;
            int p1 = lo + (int) Long.remainderUnsigned(state, span);
            int p2 = lo + (int) Long.remainderUnsigned(state >>> 21, span);
            int p3 = lo + (int) Long.remainderUnsigned(state >>> 42, span);
            double x1 = a[p1];
            double x2 = a[p2];
            double x3 = a[p3];
            double pivot = x1 < x2 ? (x2 < x3 ? x2 : Math.max(x1, x3)) : (x1 < x3 ? x1 : Math.max(x2, x3));
            int i = lo;
            int j = hi;
            while (i <= j) {
                while (a[i] < pivot) {
                    i++;
                }
                while (a[j] > pivot) {
                    j--;
                }
                if (i <= j) {
                    swap(a, i, j);
                    i++;
                    j--;
                }
            }
            if (k <= j) {
                hi = j;
            } else if (k >= i) {
                lo = i;
            } else {
                return a[k];
            }
        }
        return a[k];
    }

    /** Median of {@code a[0..length)} (mean of the two middle values for even length). Modified. */
    static double median(double[] a, int length) {
        int half = length / 2;
        double upper = select(a, length, half);
        if ((length & 1) == 1) {
            return upper;
        }
        double lower = a[0];
        for (int i = 1; i < half; i++) {
            if (a[i] > lower) {
                lower = a[i];
            }
        }
        return (lower + upper) / 2.0;
    }

    private static void swap(double[] a, int i, int j) {
        double t = a[i];
        a[i] = a[j];
        a[j] = t;
    }
}
