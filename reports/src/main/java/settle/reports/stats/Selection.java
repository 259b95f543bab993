package settle.reports.stats;

/** In-place selection of order statistics (quickselect with a median-of-three pivot), no allocation. */
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
        while (hi > lo) {
            int mid = (lo + hi) >>> 1;
            if (a[mid] < a[lo]) {
                swap(a, mid, lo);
            }
            if (a[hi] < a[lo]) {
                swap(a, hi, lo);
            }
            if (a[hi] < a[mid]) {
                swap(a, hi, mid);
            }
            double pivot = a[mid];
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
