package settle.reports.html;

/**
 * Arm styles that stay distinguishable for colour-blind readers: the Okabe–Ito palette (M. Okabe, K. Ito,
 * "Color Universal Design", 2008; common practice in scientific figures), yellow left out for contrast on
 * white, each colour paired with its own marker shape, and dash patterns once the colours repeat.
 */
public final class Palette {

    /** Okabe–Ito colours, yellow (#F0E442) left out. */
    private static final String[] COLOURS = {"#0072B2", "#D55E00", "#009E73", "#CC79A7", "#E69F00", "#56B4E9",
        "#000000"};
    private static final String[] DASHES = {null, "6 3", "2 2", "8 3 2 3"};

    /** Colour of a reference mark that belongs to no arm (a bound, a threshold). */
    public static final String REFERENCE = "#333333";

    /** Colour of a diverged replicate's mark. */
    public static final String DIVERGED = "#B00000";

    private Palette() {
    }

    /** A marker shape. */
    public enum Shape {
        CIRCLE, SQUARE, TRIANGLE, DIAMOND, TRIANGLE_DOWN, PLUS, CROSS
    }

    /**
     * How one arm is drawn.
     *
     * @param colour stroke and fill colour
     * @param dash SVG dash array, or null for a solid line
     * @param shape marker shape
     */
    public record Style(String colour, String dash, Shape shape) {
    }

    /** @return the style of arm {@code index} (0-based) */
    public static Style style(int index) {
        int c = index % COLOURS.length;
        int d = (index / COLOURS.length) % DASHES.length;
        Shape s = Shape.values()[(index + index / COLOURS.length) % Shape.values().length];
        return new Style(COLOURS[c], DASHES[d], s);
    }

    /**
     * A sequential colour for a heatmap cell, dark blue (low) to yellow (high): the "cividis" map, designed so that
     * readers with and without the common colour-vision deficiencies see the same order and nearly the same
     * lightness steps (J. R. Nuñez, C. R. Anderton, R. S. Renslow, "Optimizing colormaps with consideration for color
     * vision deficiency to enable accurate interpretation of scientific data", PLoS ONE 13(7): e0199239, 2018),
     * interpolated linearly between five stops (stop values from memory, checked only by eye).
     *
     * @param t position in [0, 1]
     * @return the colour as #rrggbb
     */
    public static String sequential(double t) {
        int[][] stops = {{0, 34, 78}, {61, 77, 110}, {124, 123, 120}, {188, 175, 111}, {254, 232, 56}};
        if (!(t >= 0)) {
            t = 0;
        }
        t = Math.min(1, t);
        double x = t * (stops.length - 1);
        int i = Math.min(stops.length - 2, (int) Math.floor(x));
        double f = x - i;
        int r = (int) Math.round(stops[i][0] + f * (stops[i + 1][0] - stops[i][0]));
        int g = (int) Math.round(stops[i][1] + f * (stops[i + 1][1] - stops[i][1]));
        int b = (int) Math.round(stops[i][2] + f * (stops[i + 1][2] - stops[i][2]));
        return String.format("#%02x%02x%02x", r, g, b);
    }

    /** @return true when text on the sequential colour at t should be white */
    public static boolean darkCell(double t) {
        return t < 0.55;
    }
}
