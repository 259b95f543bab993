package settle.experiments.plan;

import static settle.input.BadInputException.shown;

import settle.engine.text.NearMiss;
import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.charset.CharacterCodingException;
import java.nio.charset.CodingErrorAction;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import settle.engine.model.Activation;
import settle.engine.model.Initialisation;
import settle.engine.model.ModelSpec;
import settle.engine.schedule.NudgeLog;
import settle.engine.schedule.Schedule;
import settle.input.BadInputException;
import settle.engine.schedule.Schedules;
import settle.engine.train.Sampling;
import settle.engine.train.TrainingSettings;
import settle.datasets.DataSources;
import settle.datasets.table.TableOptions;
import settle.reports.format.Grid;

/**
 * Reads a plan file into a resolved {@link Plan}. This class is the one place where defaults are filled in
 * (the table {@link Defaults}). Unknown keys are errors with a near-miss suggestion; every error is a
 * {@link BadInputException} naming the file, line, column and key path and what is accepted.
 *
 * <p>Paths in a plan ({@code csv:PATH}, {@code libsvm:PATH}) are relative to the folder of the plan file and
 * are stored absolute in the resolved plan, so that the resolved plan written into a study directory means
 * the same data.
 */
public final class PlanParser {

    /** Widest hidden layer a plan may ask for. */
    public static final int MAX_WIDTH = 100_000;

    private static final List<String> TOP_KEYS = List.of(
            "study", "seed", "replicates", "data", "model", "training", "baseline", "arms", "grid");
    private static final List<String> DATA_KEYS = List.of(
            "source", "label", "test-fraction", "holdout-fraction", "standardize", "features", "drop", "categorical",
            "max-levels", "missing");
    /** The data keys of CSV tables (docs/datasets.md, "Tables"). */
    private static final List<String> TABLE_KEYS = List.of("features", "drop", "categorical", "max-levels", "missing");
    private static final List<String> MODEL_KEYS = List.of("kind", "hidden", "activation", "l2", "init");
    private static final List<String> TRAINING_KEYS = List.of(
            "epochs", "batch", "sampling", "momentum", "tail", "snapshots");
    private static final List<String> ARM_KEYS = List.of("name", "schedule", "average", "manual", "nudges");
    private static final List<String> NUDGE_KEYS = List.of("from", "factor", "note");
    private static final List<String> SOURCE_KINDS = List.of("bundled", "csv", "libsvm", "synthetic");
    private static final String SOURCE_FORMS = "bundled:NAME, csv:PATH, libsvm:PATH or synthetic:GENERATOR";

    private final String file;
    private final Path baseDirectory;
    private final String defaultStudy;
    private final Map<String, int[]> positions = new HashMap<>();
    private final List<String> warnings = new ArrayList<>();
    private final List<String> armPaths = new ArrayList<>();
    private final List<Grid> grids = new ArrayList<>();

    private PlanParser(String file, Path baseDirectory, String defaultStudy) {
        this.file = file;
        this.baseDirectory = baseDirectory.toAbsolutePath().normalize();
        this.defaultStudy = defaultStudy;
    }

    /**
     * Reads and resolves a plan file.
     *
     * @param planFile the plan; named in messages as given
     * @return the resolved plan
     * @throws BadInputException when the file cannot be read or the plan is not valid
     */
    public static Plan parse(Path planFile) {
        return read(planFile).plan();
    }

    /**
     * Reads and resolves a plan file, keeping the positions of its keys.
     *
     * @throws BadInputException when the file cannot be read or the plan is not valid
     */
    public static ParsedPlan read(Path planFile) {
        String name = planFile.toString();
        String text;
        try {
            text = StandardCharsets.UTF_8.newDecoder().onMalformedInput(CodingErrorAction.REPORT)
                    .onUnmappableCharacter(CodingErrorAction.REPORT)
                    .decode(ByteBuffer.wrap(Files.readAllBytes(planFile))).toString();
        } catch (NoSuchFileException e) {
            throw BadInputException.at(name, 0, 0, "", "no such file; give the path of a plan YAML file");
        } catch (CharacterCodingException e) {
            throw BadInputException.at(name, 0, 0, "", "not UTF-8 text; save the plan as UTF-8");
        } catch (IOException e) {
            throw BadInputException.at(name, 0, 0, "", "cannot read the plan: " + e.getMessage());
        }
        Path parent = planFile.toAbsolutePath().getParent();
        return read(text, name, parent == null ? Path.of("") : parent);
    }

    /**
     * Resolves plan text.
     *
     * @param text the YAML text
     * @param fileName the name used in messages; its name without extension is the default study name
     * @param baseDirectory the folder relative paths in the plan are resolved against
     * @throws BadInputException when the plan is not valid
     */
    public static ParsedPlan read(String text, String fileName, Path baseDirectory) {
        Path leaf = Path.of(fileName).getFileName();
        String stem = leaf == null ? "" : leaf.toString();
        int dot = stem.lastIndexOf('.');
        if (dot > 0) {
            stem = stem.substring(0, dot);
        }
        PlanParser p = new PlanParser(fileName, baseDirectory, stem);
        YamlNode root = YamlReader.read(text, fileName);
        Plan plan = p.resolve(root);
        return new ParsedPlan(plan, fileName, p.positions, p.warnings, p.armPaths, p.grids);
    }

    // ---------------------------------------------------------------- the plan

    private Plan resolve(YamlNode root) {
        if (!(root instanceof YamlNode.MapNode top)) {
            throw error(root, "", "a plan must be a map of keys (" + String.join(", ", TOP_KEYS)
                    + "), got " + root.describe());
        }
        checkKeys(top, "", "the plan", TOP_KEYS);
        String study;
        if (top.entries.containsKey("study") && !present(top, "study")) {
            // `study: ""` or `study:` would silently fall back to the file's name: say so instead
            throw error(value(top, "study"), "study", "is empty; give the study's name (1-100 letters, digits, '.',"
                    + " '_' or '-', not starting with '.'), or leave the key out to name it after the plan file");
        }
        if (present(top, "study")) {
            study = string(top, "", "study");
            if (!Plan.validStudyName(study)) {
                throw error(value(top, "study"), "study", "must be 1-100 letters, digits, '.', '_' or '-', "
                        + "not starting with '.' (it names the study directory), got " + shown(study));
            }
        } else {
            if (!Plan.validStudyName(defaultStudy)) {
                throw error(top, "study", "missing; the file name " + shown(defaultStudy) + " cannot name a study "
                        + "directory, so give 'study:' (letters, digits, '.', '_' or '-')");
            }
            study = defaultStudy;
        }
        long seed = present(top, "seed")
                ? integer(top, "", "seed", Long.MIN_VALUE, Long.MAX_VALUE, "an integer (any 64-bit value)")
                : Defaults.SEED;
        int replicates = present(top, "replicates")
                ? (int) integer(top, "", "replicates", 1, Plan.MAX_REPLICATES, null)
                : Defaults.REPLICATES;
        DataPlan data = data(requiredMap(top, "", "data", "source (" + SOURCE_FORMS + ")"));
        ModelSpec model = model(optionalMap(top, "", "model"));
        TrainingSettings training = training(optionalMap(top, "", "training"));

        List<Template> templates = arms(top);
        List<ArmPlan> arms = expand(top, templates, data);

        String baseline = baseline(top, templates, arms);
        return new Plan(study, seed, replicates, data, model, training, baseline, arms);
    }

    private DataPlan data(YamlNode.MapNode m) {
        checkKeys(m, "data", "data", DATA_KEYS);
        if (!present(m, "source")) {
            throw error(m, "data.source", "missing; accepted: " + SOURCE_FORMS);
        }
        String raw = string(m, "data", "source");
        YamlNode at = value(m, "source");
        int colon = raw.indexOf(':');
        if (colon < 0) {
            String hint = raw.matches("[A-Za-z0-9_-]+") ? "; did you mean 'bundled:" + raw + "'?"
                    : raw.toLowerCase(Locale.ROOT).endsWith(".csv") ? "; did you mean 'csv:" + raw + "'?" : "";
            throw error(at, "data.source", "must be " + SOURCE_FORMS + ", got " + shown(raw) + hint);
        }
        String kind = raw.substring(0, colon);
        String rest = raw.substring(colon + 1).trim();
        if (!SOURCE_KINDS.contains(kind)) {
            throw error(at, "data.source", "unknown data source kind " + shown(kind)
                    + NearMiss.suggestion(kind, SOURCE_KINDS) + " (accepted: " + SOURCE_FORMS + ")");
        }
        if (rest.isEmpty()) {
            throw error(at, "data.source", "'" + kind + ":' needs a "
                    + (kind.equals("csv") || kind.equals("libsvm") ? "file path" : "name") + " after the colon"
                    + " (accepted: " + SOURCE_FORMS + ")");
        }
        String source;
        if (kind.equals("csv") || kind.equals("libsvm")) {
            Path path;
            try {
                path = Path.of(rest);
            } catch (java.nio.file.InvalidPathException e) {
                throw error(at, "data.source", "not a valid file path: " + shown(rest));
            }
            source = kind + ":" + baseDirectory.resolve(path).normalize();
        } else {
            source = kind + ":" + rest;
        }
        String label = present(m, "label") ? string(m, "data", "label") : null;
        double test = present(m, "test-fraction")
                ? number(m, "data", "test-fraction", Range.OPEN_UNIT) : Defaults.TEST_FRACTION;
        double holdout = present(m, "holdout-fraction")
                ? number(m, "data", "holdout-fraction", Range.HALF_OPEN_UNIT) : Defaults.HOLDOUT_FRACTION;
        boolean standardize = present(m, "standardize") ? bool(m, "data", "standardize") : Defaults.STANDARDIZE;
        if (!kind.equals("csv") && !DataSources.isBundledTable(source)) {
            for (String key : TABLE_KEYS) {
                if (present(m, key)) {
                    throw error(value(m, key), "data." + key, "applies to csv: tables and bundled tables ("
                            + String.join(", ", DataSources.bundledTables()) + ") only, not to " + shown(source)
                            + " (it has no columns to choose or encode); remove it");
                }
            }
        }
        List<String> features = present(m, "features") ? columns(m, "features", false) : null;
        List<String> drop = present(m, "drop") ? columns(m, "drop", true) : List.of();
        List<String> categorical = present(m, "categorical") ? columns(m, "categorical", true) : List.of();
        int maxLevels = present(m, "max-levels")
                ? (int) integer(m, "data", "max-levels", 2, Integer.MAX_VALUE, null) : TableOptions.DEFAULT_MAX_LEVELS;
        TableOptions.Missing missing = TableOptions.Missing.REFUSE;
        if (present(m, "missing")) {
            YamlNode v = value(m, "missing");
            List<String> accepted = List.of("refuse", "drop-rows", "impute");
            String text = v instanceof YamlNode.Scalar sc && sc.type != YamlNode.ScalarType.NULL ? sc.text : null;
            if (text == null || !accepted.contains(text)) {
                throw error(v, "data.missing", "must be one of refuse | drop-rows | impute, got "
                        + (text == null ? v.describe() : "'" + text + "'" + NearMiss.suggestion(text, accepted)));
            }
            missing = TableOptions.Missing.parse(text);
        }
        return new DataPlan(source, label, test, holdout, standardize,
                new TableOptions(features, drop, categorical, maxLevels, missing));
    }

    /** A list of CSV column names (numbers and words alike are names). */
    private List<String> columns(YamlNode.MapNode m, String key, boolean mayBeEmpty) {
        YamlNode v = value(m, key);
        String path = "data." + key;
        if (!(v instanceof YamlNode.ListNode list) || (!mayBeEmpty && list.items.isEmpty())) {
            throw error(v, path, "must be a " + (mayBeEmpty ? "" : "non-empty ") + "list of column names such as"
                    + " [age, income], got " + v.describe());
        }
        List<String> out = new ArrayList<>();
        for (int i = 0; i < list.items.size(); i++) {
            YamlNode item = list.items.get(i);
            if (!(item instanceof YamlNode.Scalar sc) || sc.type == YamlNode.ScalarType.NULL) {
                throw error(item, path + "[" + i + "]", "must be a column name, got " + item.describe());
            }
            out.add(sc.text);
        }
        return out;
    }

    private ModelSpec model(YamlNode.MapNode m) {
        if (m == null) {
            return new ModelSpec(Defaults.MODEL, List.of(), null, Defaults.L2, null);
        }
        checkKeys(m, "model", "model", MODEL_KEYS);
        ModelSpec.Kind kind = present(m, "kind")
                ? choice(m, "model", "kind", ModelSpec.Kind.class) : Defaults.MODEL;
        List<Integer> hidden = List.of();
        Activation activation = null;
        // validated whatever the kind, so that a misspelt value is caught; a logistic model ignores them
        List<Integer> widths = present(m, "hidden") ? widths(m) : List.of(Defaults.HIDDEN);
        Activation act = present(m, "activation")
                ? choice(m, "model", "activation", Activation.class) : Defaults.ACTIVATION;
        if (kind == ModelSpec.Kind.LOGISTIC) {
            for (String k : List.of("hidden", "activation")) {
                if (present(m, k)) {
                    YamlNode.Entry e = m.entries.get(k);
                    warnings.add(BadInputException.at(file, e.keyLine, e.keyColumn, "model." + k,
                            "applies to kind: mlp only; ignored for this logistic model").getMessage());
                }
            }
        } else {
            hidden = widths;
            activation = act;
        }
        double l2 = present(m, "l2") ? number(m, "model", "l2", Range.NON_NEGATIVE) : Defaults.L2;
        Initialisation init = null; // left out: the kind's standard start (Initialisation.standard)
        if (present(m, "init")) {
            init = choice(m, "model", "init", Initialisation.class);
            if (init == Initialisation.REFERENCE && kind != ModelSpec.Kind.LOGISTIC) {
                throw error(value(m, "init"), "model.init", "'reference' starts at the exact minimiser, which "
                        + "exists for convex (logistic) models only; accepted for an mlp: zeros, glorot, he");
            }
        }
        return new ModelSpec(kind, hidden, activation, l2, init);
    }

    private List<Integer> widths(YamlNode.MapNode m) {
        YamlNode v = value(m, "hidden");
        if (!(v instanceof YamlNode.ListNode list) || list.items.isEmpty()) {
            throw error(v, "model.hidden", "must be a non-empty list of layer widths such as [32] or [64, 32], "
                    + "got " + v.describe());
        }
        List<Integer> out = new ArrayList<>();
        for (int i = 0; i < list.items.size(); i++) {
            out.add((int) integerValue(list.items.get(i), "model.hidden[" + i + "]", 1, MAX_WIDTH, null));
        }
        return out;
    }

    private TrainingSettings training(YamlNode.MapNode m) {
        if (m == null) {
            return new TrainingSettings(Defaults.EPOCHS, Defaults.BATCH, Defaults.SAMPLING, Defaults.MOMENTUM,
                    Defaults.TAIL, Defaults.SNAPSHOTS, false);
        }
        checkKeys(m, "training", "training", TRAINING_KEYS);
        int epochs = present(m, "epochs")
                ? (int) integer(m, "training", "epochs", 1, TrainingSettings.MAX_EPOCHS, null) : Defaults.EPOCHS;
        int batch = present(m, "batch")
                ? (int) integer(m, "training", "batch", 1, Integer.MAX_VALUE, null) : Defaults.BATCH;
        Sampling sampling = present(m, "sampling")
                ? choice(m, "training", "sampling", Sampling.class) : Defaults.SAMPLING;
        double momentum = present(m, "momentum")
                ? number(m, "training", "momentum", Range.HALF_OPEN_UNIT) : Defaults.MOMENTUM;
        double tail = present(m, "tail") ? number(m, "training", "tail", Range.LEFT_OPEN_UNIT) : Defaults.TAIL;
        int snapshots = present(m, "snapshots")
                ? (int) integer(m, "training", "snapshots", 2, Integer.MAX_VALUE, null) : Defaults.SNAPSHOTS;
        return new TrainingSettings(epochs, batch, sampling, momentum, tail, snapshots, false);
    }

    // ---------------------------------------------------------------- arms and grid

    /** An arm as written, before grid expansion. */
    private static final class Template {
        final int index;
        final String name;
        final YamlNode.MapNode item;
        final YamlNode.MapNode schedule;
        final ArmPlan.Averaging average;
        final boolean manual;
        final List<NudgeLog.Entry> nudges;
        int grid = -1;
        /** The keys the grid sweeps and their values as written (set when a grid expands this arm). */
        List<String> gridKeys;
        List<List<String>> gridValues;
        /** Per expanded arm, its value of each key as written. */
        List<List<String>> gridChoices;

        Template(int index, String name, YamlNode.MapNode item, YamlNode.MapNode schedule,
                ArmPlan.Averaging average, boolean manual, List<NudgeLog.Entry> nudges) {
            this.nudges = nudges;
            this.index = index;
            this.name = name;
            this.item = item;
            this.schedule = schedule;
            this.average = average;
            this.manual = manual;
        }

        String path() {
            return "arms[" + index + "]";
        }
    }

    private List<Template> arms(YamlNode.MapNode top) {
        if (!present(top, "arms")) {
            throw error(top, "arms", "missing; a plan needs a list of arms, each "
                    + "{name: NAME, schedule: {kind: KIND, …}}");
        }
        YamlNode v = value(top, "arms");
        if (!(v instanceof YamlNode.ListNode list) || list.items.isEmpty()) {
            throw error(v, "arms", "must be a non-empty list of arms, each {name: NAME, schedule: {kind: KIND, …}}, "
                    + "got " + v.describe());
        }
        List<Template> out = new ArrayList<>();
        for (int i = 0; i < list.items.size(); i++) {
            String path = "arms[" + i + "]";
            YamlNode item = list.items.get(i);
            record(path, item);
            if (!(item instanceof YamlNode.MapNode arm)) {
                throw error(item, path, "an arm must be a map {name: NAME, schedule: {kind: KIND, …}}, got "
                        + item.describe());
            }
            checkKeys(arm, path, "an arm", ARM_KEYS);
            if (!present(arm, "schedule")) {
                throw error(arm, path + ".schedule", "missing; every arm needs a schedule such as "
                        + "{kind: constant, rate: 0.1} (kinds: " + String.join(", ", Schedules.kinds()) + ")");
            }
            YamlNode s = value(arm, "schedule");
            if (!(s instanceof YamlNode.MapNode schedule)) {
                throw error(s, path + ".schedule", "must be a map such as {kind: constant, rate: 0.1}, got "
                        + s.describe());
            }
            recordTree(path + ".schedule", schedule);
            String kind = kind(schedule, path + ".schedule");
            String name = present(arm, "name") ? string(arm, path, "name") : kind;
            if (name.isBlank()) {
                throw error(value(arm, "name"), path + ".name", "must not be blank");
            }
            ArmPlan.Averaging average = present(arm, "average")
                    ? choice(arm, path, "average", ArmPlan.Averaging.class) : ArmPlan.Averaging.NONE;
            boolean manual = present(arm, "manual") && bool(arm, path, "manual");
            if (manual && "plateau".equals(kind)) {
                throw error(value(arm, "manual"), path + ".manual", "a manual arm needs a schedule that is a pure"
                        + " function of the counters; plateau cuts on each replicate's own losses, so its replicates"
                        + " would not share one rate (use manual: false, or another kind)");
            }
            List<NudgeLog.Entry> nudges = present(arm, "nudges") ? nudges(value(arm, "nudges"), path + ".nudges")
                    : List.of();
            out.add(new Template(i, name, arm, schedule, average, manual, nudges));
        }
        return out;
    }

    private List<NudgeLog.Entry> nudges(YamlNode v, String path) {
        String form = "a list of {from: EPOCH, factor: F, note: TEXT}";
        if (!(v instanceof YamlNode.ListNode list)) {
            throw error(v, path, "must be " + form + ", got " + v.describe());
        }
        List<NudgeLog.Entry> out = new ArrayList<>();
        for (int j = 0; j < list.items.size(); j++) {
            String at = path + "[" + j + "]";
            YamlNode item = list.items.get(j);
            record(at, item);
            if (!(item instanceof YamlNode.MapNode m)) {
                throw error(item, at, "must be a map {from: EPOCH, factor: F, note: TEXT}, got " + item.describe());
            }
            checkKeys(m, at, "a nudge", NUDGE_KEYS);
            for (String key : List.of("from", "factor")) {
                if (!present(m, key)) {
                    throw error(m, at + "." + key, "missing; a nudge is {from: EPOCH, factor: F, note: TEXT}");
                }
            }
            int from = (int) integer(m, at, "from", 1, Integer.MAX_VALUE, null);
            double factor = number(m, at, "factor", Range.NON_NEGATIVE);
            if (factor == 0) {
                throw error(value(m, "factor"), at + ".factor", "must be a positive number, got 0");
            }
            String note = present(m, "note") ? string(m, at, "note") : "";
            out.add(new NudgeLog.Entry(from, factor, note));
        }
        return out;
    }

    private String kind(YamlNode.MapNode schedule, String path) {
        if (!present(schedule, "kind")) {
            throw error(schedule, path + ".kind", "missing; accepted kinds: " + String.join(", ", Schedules.kinds()));
        }
        YamlNode k = value(schedule, "kind");
        if (!(k instanceof YamlNode.Scalar sc) || sc.type != YamlNode.ScalarType.STRING) {
            throw error(k, path + ".kind", "must be a schedule kind (" + String.join(", ", Schedules.kinds())
                    + "), got " + k.describe());
        }
        if (!Schedules.kinds().contains(sc.text)) {
            throw error(k, path + ".kind", "unknown schedule kind " + shown(sc.text)
                    + NearMiss.suggestion(sc.text, Schedules.kinds())
                    + " (accepted: " + String.join(", ", Schedules.kinds()) + ")");
        }
        return sc.text;
    }

    private List<ArmPlan> expand(YamlNode.MapNode top, List<Template> templates, DataPlan data) {
        List<List<ArmPlan>> perTemplate = new ArrayList<>();
        for (Template t : templates) {
            perTemplate.add(null);
        }
        if (present(top, "grid")) {
            YamlNode g = value(top, "grid");
            if (!(g instanceof YamlNode.ListNode grid)) {
                throw error(g, "grid", "must be a list of {arm: NAME, KEY: [values], …}, got " + g.describe());
            }
            for (int gi = 0; gi < grid.items.size(); gi++) {
                String path = "grid[" + gi + "]";
                YamlNode item = grid.items.get(gi);
                record(path, item);
                if (!(item instanceof YamlNode.MapNode entry)) {
                    throw error(item, path, "a grid entry must be a map {arm: NAME, KEY: [values], …}, got "
                            + item.describe());
                }
                Template t = gridTemplate(entry, path, templates);
                t.grid = gi;
                perTemplate.set(t.index, expandOne(entry, path, t, data));
            }
        }
        List<ArmPlan> arms = new ArrayList<>();
        Map<String, String> seen = new LinkedHashMap<>();
        Grid[] byEntry = new Grid[templates.size()];
        int entries = 0;
        for (Template t : templates) {
            List<ArmPlan> expanded = perTemplate.get(t.index);
            if (t.grid >= 0) {
                List<Grid.Member> indices = new ArrayList<>();
                for (int i = 0; i < expanded.size(); i++) {
                    indices.add(new Grid.Member(arms.size() + i, t.gridChoices.get(i)));
                }
                byEntry[t.grid] = new Grid(t.name, t.gridKeys, t.gridValues, indices);
                entries = Math.max(entries, t.grid + 1);
            }
            if (expanded == null) {
                Map<String, Object> raw = rawSchedule(t.schedule);
                expanded = List.of(arm(t, t.name, raw, t.path() + ".schedule", null, data));
            }
            for (ArmPlan a : expanded) {
                String where = t.grid >= 0 ? "grid[" + t.grid + "] (expanding " + t.path() + ")" : t.path();
                String earlier = seen.putIfAbsent(a.name(), where);
                if (earlier != null) {
                    String at = t.grid >= 0 ? "grid[" + t.grid + "]" : t.path() + ".name";
                    YamlNode node = t.grid >= 0 ? null : (present(t.item, "name")
                            ? value(t.item, "name") : t.item);
                    String detail = "duplicate arm name " + shown(a.name()) + " (also from " + earlier
                            + "); arm names must be unique"
                            + (present(t.item, "name") ? "" : ": give each arm a 'name'");
                    throw node == null ? positioned(at, detail) : error(node, at, detail);
                }
                arms.add(a);
                armPaths.add(t.path());
            }
        }
        for (int g = 0; g < entries; g++) {
            grids.add(byEntry[g]);
        }
        return arms;
    }

    private Template gridTemplate(YamlNode.MapNode entry, String path, List<Template> templates) {
        if (!present(entry, "arm")) {
            throw error(entry, path + ".arm", "missing; a grid entry names the arm it expands: "
                    + "{arm: NAME, KEY: [values], …}");
        }
        String name = string(entry, path, "arm");
        List<String> names = new ArrayList<>();
        for (Template t : templates) {
            names.add(t.name);
        }
        for (Template t : templates) {
            if (t.name.equals(name)) {
                if (t.grid >= 0) {
                    throw error(value(entry, "arm"), path + ".arm", "arm " + shown(name) + " is already expanded by grid["
                            + t.grid + "]; put all its keys in one grid entry");
                }
                if (entry.entries.size() < 2) {
                    throw error(entry, path, "names no schedule key to vary; add KEY: [values] for a key of arm "
                            + shown(name));
                }
                return t;
            }
        }
        throw error(value(entry, "arm"), path + ".arm", "no arm named " + shown(name)
                + NearMiss.suggestion(name, names) + " (arms: " + quoted(names) + ")");
    }

    private List<ArmPlan> expandOne(YamlNode.MapNode entry, String path, Template t, DataPlan data) {
        List<String> keys = new ArrayList<>();
        List<YamlNode.ListNode> values = new ArrayList<>();
        for (YamlNode.Entry e : entry.entries.values()) {
            if (e.key.equals("arm")) {
                continue;
            }
            String kp = path + "." + e.key;
            record(kp, e.value);
            if (!(e.value instanceof YamlNode.ListNode list) || list.items.isEmpty()) {
                throw error(e.value, kp, "must be a non-empty list of values for schedule key '" + e.key
                        + "', such as [0.05, 0.1], got " + e.value.describe());
            }
            for (int i = 0; i < list.items.size(); i++) {
                record(kp + "[" + i + "]", list.items.get(i));
            }
            keys.add(e.key);
            values.add(list);
        }
        long combinations = 1;
        for (YamlNode.ListNode l : values) {
            combinations *= l.items.size();
            if (combinations > 10_000) {
                throw error(entry, path, "expands arm " + shown(t.name) + " into more than 10000 arms; "
                        + "a grid may expand one arm into at most 10000");
            }
        }
        List<ArmPlan> out = new ArrayList<>();
        t.gridKeys = keys;
        t.gridValues = new ArrayList<>();
        for (YamlNode.ListNode list : values) {
            List<String> written = new ArrayList<>();
            for (YamlNode v : list.items) {
                written.add(spell(v));
            }
            t.gridValues.add(written);
        }
        t.gridChoices = new ArrayList<>();
        int[] choice = new int[keys.size()];
        for (long c = 0; c < combinations; c++) {
            Map<String, Object> raw = rawSchedule(t.schedule);
            StringBuilder name = new StringBuilder(t.name).append('[');
            Map<String, String> origin = new HashMap<>();
            List<String> chosen = new ArrayList<>();
            for (int k = 0; k < keys.size(); k++) {
                YamlNode v = values.get(k).items.get(choice[k]);
                raw.put(keys.get(k), v.toJava());
                origin.put(keys.get(k), path + "." + keys.get(k) + "[" + choice[k] + "]");
                name.append(k == 0 ? "" : ",").append(keys.get(k)).append('=').append(spell(v));
                chosen.add(spell(v));
            }
            name.append(']');
            t.gridChoices.add(chosen);
            out.add(arm(t, name.toString(), raw, t.path() + ".schedule", origin, data));
            for (int k = keys.size() - 1; k >= 0; k--) {
                // the last key varies fastest
                if (++choice[k] < values.get(k).items.size()) {
                    break;
                }
                choice[k] = 0;
            }
        }
        return out;
    }

    private ArmPlan arm(Template t, String name, Map<String, Object> raw, String schedulePath,
            Map<String, String> gridOrigin, DataPlan data) {
        Schedule schedule;
        try {
            schedule = Schedules.parse(raw);
        } catch (BadInputException e) {
            String key = e.key() == null ? "" : e.key();
            String top = key.split("[.\\[]", 2)[0];
            String detail = e.getMessage();
            if (gridOrigin != null && gridOrigin.containsKey(top)) {
                String at = gridOrigin.get(top) + key.substring(top.length());
                throw positioned(at, detail + " (in arm " + shown(name) + ")");
            }
            throw positioned(key.isEmpty() ? schedulePath : schedulePath + "." + key,
                    detail + (gridOrigin == null ? "" : " (in arm " + shown(name) + ")"));
        }
        Map<String, Object> resolved = schedule.resolved();
        if ("plateau".equals(resolved.get("kind")) && "holdout".equals(resolved.get("judge"))
                && data.holdoutFraction() == 0) {
            String at = gridOrigin != null && gridOrigin.containsKey("judge") ? gridOrigin.get("judge")
                    : schedulePath + ".judge";
            throw positioned(at, "judge: holdout needs a holdout split: set data.holdout-fraction above 0 "
                    + "(such as 0.2), or judge: train");
        }
        return new ArmPlan(name, new ScheduleSpec(resolved, schedule), t.average, t.manual, t.nudges);
    }

    private String baseline(YamlNode.MapNode top, List<Template> templates, List<ArmPlan> arms) {
        if (!present(top, "baseline")) {
            return arms.get(0).name();
        }
        String b = string(top, "", "baseline");
        List<String> names = new ArrayList<>();
        for (ArmPlan a : arms) {
            if (a.name().equals(b)) {
                return b;
            }
            names.add(a.name());
        }
        for (Template t : templates) {
            if (t.grid >= 0 && t.name.equals(b)) {
                throw error(value(top, "baseline"), "baseline", "arm " + shown(b) + " is expanded by grid[" + t.grid
                        + "] into several arms; name one of them, such as " + shown(firstExpanded(arms, b)));
            }
        }
        throw error(value(top, "baseline"), "baseline", "no arm named " + shown(b)
                + NearMiss.suggestion(b, names) + " (arms: " + quoted(names) + ")");
    }

    private static String firstExpanded(List<ArmPlan> arms, String template) {
        for (ArmPlan a : arms) {
            if (a.name().startsWith(template + "[")) {
                return a.name();
            }
        }
        return template;
    }

    private static String spell(YamlNode v) {
        if (v instanceof YamlNode.Scalar s) {
            return s.text;
        }
        if (v instanceof YamlNode.ListNode l) {
            StringBuilder b = new StringBuilder("[");
            for (int i = 0; i < l.items.size(); i++) {
                b.append(i == 0 ? "" : ",").append(spell(l.items.get(i)));
            }
            return b.append(']').toString();
        }
        YamlNode.MapNode m = (YamlNode.MapNode) v;
        StringBuilder b = new StringBuilder("{");
        boolean first = true;
        for (YamlNode.Entry e : m.entries.values()) {
            b.append(first ? "" : ",").append(e.key).append(':').append(spell(e.value));
            first = false;
        }
        return b.append('}').toString();
    }

    @SuppressWarnings("unchecked")
    private static Map<String, Object> rawSchedule(YamlNode.MapNode schedule) {
        return (Map<String, Object>) schedule.toJava();
    }

    // ---------------------------------------------------------------- typed values

    /** Numeric ranges with their wording. */
    private enum Range {
        OPEN_UNIT("a number in (0, 1)"),
        HALF_OPEN_UNIT("a number in [0, 1)"),
        LEFT_OPEN_UNIT("a number in (0, 1]"),
        NON_NEGATIVE("a number ≥ 0");

        final String wording;

        Range(String wording) {
            this.wording = wording;
        }

        boolean contains(double v) {
            return switch (this) {
                case OPEN_UNIT -> v > 0 && v < 1;
                case HALF_OPEN_UNIT -> v >= 0 && v < 1;
                case LEFT_OPEN_UNIT -> v > 0 && v <= 1;
                case NON_NEGATIVE -> v >= 0;
            };
        }
    }

    private double number(YamlNode.MapNode m, String parent, String key, Range range) {
        YamlNode v = value(m, key);
        String path = join(parent, key);
        if (v instanceof YamlNode.Scalar s && (s.type == YamlNode.ScalarType.FLOAT || s.type == YamlNode.ScalarType.INTEGER)) {
            double d = ((Number) s.value).doubleValue();
            if (Double.isFinite(d) && range.contains(d)) {
                return d;
            }
        }
        throw error(v, path, "must be " + range.wording + ", got " + v.describe() + quotedNumberHint(v));
    }

    private long integer(YamlNode.MapNode m, String parent, String key, long min, long max, String wording) {
        return integerValue(value(m, key), join(parent, key), min, max, wording);
    }

    private long integerValue(YamlNode v, String path, long min, long max, String wording) {
        String want = wording != null ? wording
                : max == Integer.MAX_VALUE || max == Long.MAX_VALUE ? "an integer ≥ " + min
                : "an integer in " + min + ".." + max;
        if (v instanceof YamlNode.Scalar s && s.type == YamlNode.ScalarType.INTEGER) {
            java.math.BigInteger b = (java.math.BigInteger) s.value;
            if (b.compareTo(java.math.BigInteger.valueOf(min)) >= 0 && b.compareTo(java.math.BigInteger.valueOf(max)) <= 0) {
                return b.longValue();
            }
        }
        if (v instanceof YamlNode.Scalar s && s.type == YamlNode.ScalarType.FLOAT) {
            double d = (Double) s.value;
            if (d == Math.rint(d) && d >= min && d <= max && Math.abs(d) < 1e15) {
                return (long) d;
            }
        }
        throw error(v, path, "must be " + want + ", got " + v.describe() + quotedNumberHint(v));
    }

    private boolean bool(YamlNode.MapNode m, String parent, String key) {
        YamlNode v = value(m, key);
        if (v instanceof YamlNode.Scalar s && s.type == YamlNode.ScalarType.BOOLEAN) {
            return (Boolean) s.value;
        }
        throw error(v, join(parent, key), "must be true or false, got " + v.describe());
    }

    private String string(YamlNode.MapNode m, String parent, String key) {
        YamlNode v = value(m, key);
        if (v instanceof YamlNode.Scalar s && s.type != YamlNode.ScalarType.NULL) {
            return s.text;
        }
        throw error(v, join(parent, key), "must be a text value, got " + v.describe());
    }

    private <E extends Enum<E>> E choice(YamlNode.MapNode m, String parent, String key, Class<E> type) {
        YamlNode v = value(m, key);
        List<String> accepted = new ArrayList<>();
        for (E e : type.getEnumConstants()) {
            accepted.add(e.name().toLowerCase(Locale.ROOT));
        }
        if (v instanceof YamlNode.Scalar s && s.type != YamlNode.ScalarType.NULL) {
            for (E e : type.getEnumConstants()) {
                if (e.name().toLowerCase(Locale.ROOT).equals(s.text)) {
                    return e;
                }
            }
            throw error(v, join(parent, key), "must be one of " + String.join(" | ", accepted) + ", got "
                    + shown(s.text) + NearMiss.suggestion(s.text, accepted));
        }
        throw error(v, join(parent, key), "must be one of " + String.join(" | ", accepted) + ", got " + v.describe());
    }

    private static String quotedNumberHint(YamlNode v) {
        if (v instanceof YamlNode.Scalar s && s.type == YamlNode.ScalarType.STRING) {
            try {
                Double.parseDouble(s.text);
                return " (a quoted string; write the number without quotes)";
            } catch (NumberFormatException e) {
                return "";
            }
        }
        return "";
    }

    // ---------------------------------------------------------------- maps, keys, positions

    private YamlNode.MapNode requiredMap(YamlNode.MapNode top, String parent, String key, String needs) {
        if (!present(top, key)) {
            throw error(top, join(parent, key), "missing; a plan needs '" + key + ":' with at least " + needs);
        }
        return map(top, parent, key);
    }

    private YamlNode.MapNode optionalMap(YamlNode.MapNode top, String parent, String key) {
        return present(top, key) ? map(top, parent, key) : null;
    }

    private YamlNode.MapNode map(YamlNode.MapNode parentMap, String parent, String key) {
        YamlNode v = value(parentMap, key);
        if (v instanceof YamlNode.MapNode m) {
            return m;
        }
        List<String> keys = switch (key) {
            case "data" -> DATA_KEYS;
            case "model" -> MODEL_KEYS;
            case "training" -> TRAINING_KEYS;
            default -> List.of();
        };
        throw error(v, join(parent, key), "must be a map of keys (" + String.join(", ", keys) + "), got "
                + v.describe());
    }

    private void checkKeys(YamlNode.MapNode m, String path, String where, List<String> accepted) {
        for (YamlNode.Entry e : m.entries.values()) {
            String kp = join(path, e.key);
            record(kp, e.value, e);
            if (!accepted.contains(e.key)) {
                throw BadInputException.at(file, e.keyLine, e.keyColumn, kp, "unknown key " + shown(e.key) + " in "
                        + where + NearMiss.suggestion(e.key, accepted) + " (accepted: "
                        + String.join(", ", accepted) + ")");
            }
        }
    }

    /** @return true when {@code key} is written with a value ({@code key: null} and {@code key:} count as absent) */
    private static boolean present(YamlNode.MapNode m, String key) {
        YamlNode.Entry e = m.entries.get(key);
        return e != null && !(e.value instanceof YamlNode.Scalar s && s.type == YamlNode.ScalarType.NULL);
    }

    private YamlNode value(YamlNode.MapNode m, String key) {
        return m.entries.get(key).value;
    }

    private void record(String path, YamlNode v) {
        positions.putIfAbsent(path, new int[] {v.line, v.column});
    }

    private void record(String path, YamlNode v, YamlNode.Entry e) {
        if (v instanceof YamlNode.Scalar) {
            positions.putIfAbsent(path, new int[] {v.line, v.column});
        } else {
            positions.putIfAbsent(path, new int[] {e.keyLine, e.keyColumn});
        }
    }

    private void recordTree(String path, YamlNode node) {
        if (node instanceof YamlNode.MapNode m) {
            for (YamlNode.Entry e : m.entries.values()) {
                record(path + "." + e.key, e.value, e);
                recordTree(path + "." + e.key, e.value);
            }
        } else if (node instanceof YamlNode.ListNode l) {
            for (int i = 0; i < l.items.size(); i++) {
                record(path + "[" + i + "]", l.items.get(i));
                recordTree(path + "[" + i + "]", l.items.get(i));
            }
        }
    }

    private BadInputException positioned(String path, String detail) {
        String p = path;
        while (true) {
            int[] pos = positions.get(p);
            if (pos != null) {
                return BadInputException.at(file, pos[0], pos[1], path, detail);
            }
            int cut = Math.max(p.lastIndexOf('.'), p.lastIndexOf('['));
            if (cut <= 0) {
                return BadInputException.at(file, 0, 0, path, detail);
            }
            p = p.substring(0, cut);
        }
    }

    private BadInputException error(YamlNode at, String path, String detail) {
        return BadInputException.at(file, at.line, at.column, path, detail);
    }

    private static String join(String parent, String key) {
        return parent.isEmpty() ? key : parent + "." + key;
    }

    private static String quoted(List<String> names) {
        StringBuilder b = new StringBuilder();
        for (String n : names) {
            b.append(b.length() == 0 ? "" : ", ").append('\'').append(n).append('\'');
        }
        return b.toString();
    }
}
