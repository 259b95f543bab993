package settle.datasets;

import settle.input.BadInputException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import settle.datasets.bundled.BundledData;
import settle.datasets.bundled.BundledDataset;
import settle.datasets.io.LibsvmReader;
import settle.datasets.synthetic.Synthetic;
import settle.datasets.table.SourceTable;
import settle.datasets.table.TableEncoder;
import settle.datasets.table.TableOptions;
import settle.datasets.table.TableReader;

/**
 * Turns a data source string (a plan's {@code data.source}, the {@code --data} option) into a {@link Dataset}.
 *
 * <pre>
 *   csv:PATH                    a CSV table with a header row (delimiter detected; text columns are
 *                               categorical; see {@link #prepare} for the plan's column keys)
 *   csv:PATH?delimiter=D        D = comma | semicolon | tab | auto
 *   libsvm:PATH                 a LIBSVM / SVMlight text file
 *   bundled:NAME                wdbc | wine | satellite | housevotes84 (a table with text columns and gaps:
 *                               read like a csv: table, so the plan's column keys apply)
 *   synthetic:gaussian?rows=500&amp;features=5&amp;classes=2&amp;separation=2&amp;correlation=0&amp;seed=1
 *   synthetic:xor?rows=400&amp;noise=0.5&amp;seed=1
 *   synthetic:frost?rows=1000&amp;seed=1       the demo scenario (invented data)
 * </pre>
 * Synthetic parameters are optional; the values shown are the defaults. A relative PATH is resolved against
 * the directory given (the plan's directory), else against the working directory. The dataset's name is the
 * source as written (csv/libsvm: the PATH as written), and error messages use it.
 */
public final class DataSources {

    /** The accepted prefixes, in the order messages list them. */
    public static final List<String> PREFIXES = List.of("csv:", "libsvm:", "bundled:", "synthetic:");

    /** The synthetic generators, in the order messages list them. */
    public static final List<String> GENERATORS = List.of("gaussian", "xor", "frost");

    private DataSources() {
    }

    /**
     * @param source the source string, e.g. {@code csv:data/train.csv} or {@code bundled:wdbc}
     * @param labelColumn the label column of a CSV file (null: the last column); for bundled data null or
     *        the dataset's own label name; for LIBSVM and synthetic data it must be null
     * @param relativeTo the directory relative paths are resolved against, or null for the working directory
     * @return the dataset
     * @throws BadInputException for an unknown prefix, bad parameters, a missing file or malformed content
     */
    public static Dataset load(String source, String labelColumn, Path relativeTo) {
        if (source == null || source.isBlank()) {
            throw BadInputException.of("", "data source is empty; expected one of " + String.join(", ", PREFIXES)
                    + " followed by a path or name, e.g. csv:data.csv");
        }
        String s = source.strip();
        if (s.startsWith("csv:") || isBundledTable(s)) {
            return prepare(source, labelColumn, TableOptions.DEFAULTS, relativeTo, SplitRule.NONE).all();
        }
        if (s.startsWith("libsvm:")) {
            String path = requirePath(source, s.substring(7));
            noLabel(source, labelColumn, "LIBSVM data carry the label as the first field of each line");
            return LibsvmReader.read(resolve(path, relativeTo), path);
        }
        if (s.startsWith("bundled:")) {
            return BundledData.load(s.substring(8), labelColumn);
        }
        if (s.startsWith("synthetic:")) {
            noLabel(source, labelColumn, "synthetic data carry their own labels");
            return synthetic(source, s.substring(10));
        }
        throw BadInputException.of("", "data source '" + source + "' has no known prefix; expected one of "
                + String.join(", ", PREFIXES) + " (e.g. csv:data.csv, libsvm:data.txt, bundled:wdbc, synthetic:frost)");
    }

    /**
     * Reads a data source and splits it the way studies do: the test split from every row, the holdout from the
     * rest ({@link Splits#parts}); a CSV table is then encoded under {@code options} with everything fitted on the
     * training rows alone ({@link TableEncoder}).
     *
     * @param source the source string
     * @param labelColumn as for {@link #load}
     * @param options the plan's {@code data.features}, {@code data.drop}, {@code data.categorical},
     *        {@code data.max-levels} and {@code data.missing}; only their defaults are accepted for sources other
     *        than {@code csv:}
     * @param relativeTo the directory relative paths are resolved against, or null for the working directory
     * @param rule the split fractions and seeds ({@link SplitRule#NONE}: every row trains)
     * @return the kept rows and the splits
     * @throws BadInputException as {@link #load}, and keyed ({@link BadInputException#key()}) for the problems one of the
     *         plan's {@code data} keys causes or can fix
     */
    public static PreparedData prepare(String source, String labelColumn, TableOptions options, Path relativeTo,
            SplitRule rule) {
        if (source != null && (source.strip().startsWith("csv:") || isBundledTable(source.strip()))) {
            SourceTable table = readTable(source, labelColumn, relativeTo);
            int[][] parts = Splits.parts(table.name(), table.labels(), table.classNames(), rule);
            return TableEncoder.prepare(table, options, parts[0], parts[1], parts[2]);
        }
        if (!options.isDefault()) {
            throw BadInputException.of("data." + firstSetKey(options), source + ": data." + firstSetKey(options)
                    + " applies to csv: tables and bundled tables (" + String.join(", ", bundledTables())
                    + ") only; expected it absent for this source");
        }
        Dataset all = load(source, labelColumn, relativeTo);
        int[][] parts = Splits.parts(all.name(), all.labels(), all.classNames(), rule);
        return new PreparedData(all, parts[0], parts[1], parts[2], null, List.of());
    }

    private static String firstSetKey(TableOptions o) {
        TableOptions d = TableOptions.DEFAULTS;
        return o.features() != null ? "features" : !o.drop().isEmpty() ? "drop"
                : !o.categorical().isEmpty() ? "categorical" : o.maxLevels() != d.maxLevels() ? "max-levels" : "missing";
    }

    /**
     * @param source a source string, stripped
     * @return whether it names a bundled table ({@link BundledDataset#table()}), which is read and encoded like a
     *         {@code csv:} table
     */
    public static boolean isBundledTable(String source) {
        if (!source.startsWith("bundled:")) {
            return false;
        }
        String name = source.substring(8);
        for (BundledDataset d : BundledData.all()) {
            if (d.name().equals(name)) {
                return d.table();
            }
        }
        return false;
    }

    /** @return the names of the bundled tables, in registry order */
    public static List<String> bundledTables() {
        List<String> names = new ArrayList<>();
        for (BundledDataset d : BundledData.all()) {
            if (d.table()) {
                names.add(d.name());
            }
        }
        return names;
    }

    /**
     * Reads a {@code csv:} source or a bundled table into its typed columns.
     *
     * @param source {@code csv:PATH}, {@code csv:PATH?delimiter=D} or {@code bundled:NAME} of a bundled table
     * @param labelColumn the label column, or null for the last
     * @param relativeTo the directory relative paths are resolved against, or null for the working directory
     * @return the table as read
     * @throws BadInputException for a bad source string, a missing file or refused content
     */
    public static SourceTable readTable(String source, String labelColumn, Path relativeTo) {
        String s = source.strip();
        if (isBundledTable(s)) {
            return BundledData.readTable(s.substring(8), labelColumn);
        }
        if (!s.startsWith("csv:")) {
            throw BadInputException.of("", source + ": not a csv: source or bundled table; expected csv:PATH");
        }
        String rest = s.substring(4);
        char delimiter = TableReader.DETECT;
        int q = rest.lastIndexOf('?');
        if (q >= 0 && rest.startsWith("delimiter=", q + 1)) {
            String d = rest.substring(q + 1 + "delimiter=".length());
            delimiter = switch (d) {
                case "comma", "," -> ',';
                case "semicolon", ";" -> ';';
                case "tab" -> '\t';
                case "auto" -> TableReader.DETECT;
                default -> throw BadInputException.of("", source + ": delimiter '" + d
                        + "' is not accepted; expected comma, semicolon, tab or auto");
            };
            rest = rest.substring(0, q);
        }
        String path = requirePath(source, rest);
        return TableReader.read(resolve(path, relativeTo), path, labelColumn, delimiter);
    }

    private static String requirePath(String source, String path) {
        if (path.isBlank()) {
            throw BadInputException.of("", "data source '" + source + "' names no file; expected a path after the prefix");
        }
        return path;
    }

    private static Path resolve(String path, Path relativeTo) {
        Path p = Path.of(path);
        return relativeTo == null || p.isAbsolute() ? p : relativeTo.resolve(p);
    }

    private static void noLabel(String source, String labelColumn, String why) {
        if (labelColumn != null) {
            throw BadInputException.of("", source + ": a label column ('" + labelColumn + "') was given, but " + why
                    + "; expected no label option");
        }
    }

    private static Dataset synthetic(String source, String spec) {
        int q = spec.indexOf('?');
        String generator = q < 0 ? spec : spec.substring(0, q);
        Map<String, String> params = new LinkedHashMap<>();
        if (q >= 0 && q + 1 < spec.length()) {
            for (String pair : spec.substring(q + 1).split("&", -1)) {
                int eq = pair.indexOf('=');
                if (eq <= 0) {
                    throw BadInputException.of("", source + ": parameter '" + pair + "' is not key=value; expected e.g. "
                            + "synthetic:" + generator + "?rows=500&seed=7");
                }
                if (params.put(pair.substring(0, eq), pair.substring(eq + 1)) != null) {
                    throw BadInputException.of("", source + ": parameter '" + pair.substring(0, eq)
                            + "' is given twice; expected each key once");
                }
            }
        }
        Params p = new Params(source, params);
        Dataset data;
        switch (generator) {
            case "gaussian":
                p.allow("rows", "features", "classes", "separation", "correlation", "seed");
                data = Synthetic.gaussian(p.integer("rows", 500), p.integer("features", 5), p.integer("classes", 2),
                        p.number("separation", 2.0), p.number("correlation", 0.0), p.seed());
                break;
            case "xor":
                p.allow("rows", "noise", "seed");
                data = Synthetic.xor(p.integer("rows", 400), p.number("noise", 0.5), p.seed());
                break;
            case "frost":
                p.allow("rows", "seed");
                data = Synthetic.frost(p.integer("rows", 1000), p.seed());
                break;
            default:
                throw BadInputException.of("", source + ": unknown generator '" + generator + "'; expected one of "
                        + String.join(", ", GENERATORS));
        }
        return data;
    }

    /** The key=value parameters of a synthetic source. */
    private static final class Params {
        private final String source;
        private final Map<String, String> values;

        Params(String source, Map<String, String> values) {
            this.source = source;
            this.values = values;
        }

        void allow(String... keys) {
            List<String> allowed = List.of(keys);
            List<String> unknown = new ArrayList<>();
            for (String k : values.keySet()) {
                if (!allowed.contains(k)) {
                    unknown.add(k);
                }
            }
            if (!unknown.isEmpty()) {
                throw BadInputException.of("", source + ": unknown parameter '" + unknown.get(0) + "'; expected "
                        + String.join(", ", allowed));
            }
        }

        int integer(String key, int fallback) {
            String v = values.get(key);
            if (v == null) {
                return fallback;
            }
            try {
                return Integer.parseInt(v.strip());
            } catch (NumberFormatException e) {
                throw BadInputException.of("", source + ": " + key + " = '" + v + "' is not an integer; expected an integer");
            }
        }

        double number(String key, double fallback) {
            String v = values.get(key);
            if (v == null) {
                return fallback;
            }
            if (settle.datasets.io.Numbers.classify(v) != settle.datasets.io.Numbers.OK) {
                throw BadInputException.of("", source + ": " + key + " = '" + v + "' is not a finite number; expected a number");
            }
            return settle.datasets.io.Numbers.parse(v);
        }

        long seed() {
            String v = values.get("seed");
            if (v == null) {
                return 1L;
            }
            try {
                return Long.parseLong(v.strip());
            } catch (NumberFormatException e) {
                throw BadInputException.of("", source + ": seed = '" + v + "' is not an integer; expected a 64-bit integer");
            }
        }
    }
}
