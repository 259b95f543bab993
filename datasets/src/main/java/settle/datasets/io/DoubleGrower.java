package settle.datasets.io;

import java.util.Arrays;

/** A growable flat {@code double[]} for readers that do not know the row count in advance. */
final class DoubleGrower {

    private double[] values = new double[4096];
    private int size;

    void add(double v) {
        if (size == values.length) {
            if (values.length >= Integer.MAX_VALUE - 16) {
                throw new IllegalStateException("more than " + (Integer.MAX_VALUE - 16) + " values");
            }
            values = Arrays.copyOf(values, (int) Math.min(Integer.MAX_VALUE - 16L, values.length * 2L));
        }
        values[size++] = v;
    }

    int size() {
        return size;
    }

    double get(int i) {
        return values[i];
    }

    double[] toArray() {
        return size == values.length ? values : Arrays.copyOf(values, size);
    }
}
