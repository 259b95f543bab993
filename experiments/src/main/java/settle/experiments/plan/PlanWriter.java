package settle.experiments.plan;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import java.security.MessageDigest;
import java.security.NoSuchAlgorithmException;
import java.util.HexFormat;
import java.util.List;
import java.util.Map;
import java.util.regex.Pattern;
import settle.datasets.table.TableOptions;
import settle.engine.model.ModelSpec;
import settle.engine.schedule.NudgeLog;
import settle.engine.train.TrainingSettings;
import settle.reports.format.AtomicFile;
import settle.reports.format.StudyFormat;

/**
 * Writes a resolved {@link Plan} as YAML in a canonical form: every key written (defaults included, except the
 * CSV table keys {@code data.features}, {@code drop}, {@code categorical}, {@code max-levels} and {@code missing},
 * written only when they differ from their defaults so that plans without them keep their text and hash), in the
 * order of DESIGN.md's example plan; schedules as one-line flow maps in their canonical key order; strings
 * plain when unambiguous and double-quoted otherwise; integers without a point and other numbers with one
 * ({@link Double#toString}), so that {@link PlanParser} reads the text back into an equal plan. The
 * SHA-256 of that text identifies the plan in a study's manifest.
 */
public final class PlanWriter {

    /** A string that YAML reads back as the same plain string in block and flow context. */
    private static final Pattern PLAIN = Pattern.compile("[A-Za-z_][A-Za-z0-9_.\\-]*");
    /** Plain words YAML 1.1 resolves to booleans or null. */
    private static final Pattern RESERVED = Pattern.compile(
            "(?i)y|n|yes|no|true|false|on|off|null|nan|inf|infinity");

    private PlanWriter() {
    }

    /** @return the canonical YAML text of {@code plan}, ending with a newline */
    public static String toYaml(Plan plan) {
        StringBuilder b = new StringBuilder();
        b.append("# resolved plan: every default filled in, grid expanded\n");
        b.append("study: ").append(scalar(plan.study())).append('\n');
        b.append("seed: ").append(plan.seed()).append('\n');
        b.append("replicates: ").append(plan.replicates()).append('\n');
        shared(plan, b);
        b.append("baseline: ").append(scalar(plan.baseline())).append('\n');
        b.append("arms:\n");
        for (ArmPlan a : plan.arms()) {
            arm(a, b);
        }
        return b.toString();
    }

    /**
     * The shared settings as the resolved plan writes them: {@code seed}, then {@code data}, {@code model} and
     * {@code training}; everything a replicate depends on but its arm and its index. The study's name, the replicate
     * count, the baseline and the arms are not in it, so a study grows (more arms, more replicates, another
     * baseline) while its SHA-256 stays the same.
     *
     * @return the text, ending with a newline
     */
    public static String settingsYaml(Plan plan) {
        StringBuilder b = new StringBuilder();
        b.append("seed: ").append(plan.seed()).append('\n');
        shared(plan, b);
        return b.toString();
    }

    /** @return the lower-case hexadecimal SHA-256 of {@link #settingsYaml}: the manifest's {@code settings_sha256} */
    public static String settingsSha256(Plan plan) {
        return sha256(settingsYaml(plan));
    }

    /**
     * @return an arm's canonical specification: its entry under {@code arms:} in the resolved plan, ending with a
     *     newline (its name, schedule, average, manual and nudges)
     */
    public static String armYaml(ArmPlan arm) {
        StringBuilder b = new StringBuilder();
        arm(arm, b);
        return b.toString();
    }

    /**
     * @return the arm's id, the name of its directory in the study: its name made safe and the first digits of the
     *     SHA-256 of {@link #armYaml} ({@link StudyFormat#armId})
     */
    public static String armId(ArmPlan arm) {
        return StudyFormat.armId(arm.name(), sha256(armYaml(arm)));
    }

    /** Appends {@code data}, {@code model} and {@code training}. */
    private static void shared(Plan plan, StringBuilder b) {
        DataPlan d = plan.data();
        b.append("data:\n");
        b.append("  source: ").append(scalar(d.source())).append('\n');
        if (d.label() != null) {
            b.append("  label: ").append(scalar(d.label())).append('\n');
        }
        b.append("  test-fraction: ").append(number(d.testFraction())).append('\n');
        b.append("  holdout-fraction: ").append(number(d.holdoutFraction())).append('\n');
        b.append("  standardize: ").append(d.standardize()).append('\n');
        // the table keys are written when set, so that a plan without them keeps its text and hash
        TableOptions table = d.table();
        if (table.features() != null) {
            b.append("  features: ").append(flow(table.features())).append('\n');
        }
        if (!table.drop().isEmpty()) {
            b.append("  drop: ").append(flow(table.drop())).append('\n');
        }
        if (!table.categorical().isEmpty()) {
            b.append("  categorical: ").append(flow(table.categorical())).append('\n');
        }
        if (table.maxLevels() != TableOptions.DEFAULT_MAX_LEVELS) {
            b.append("  max-levels: ").append(table.maxLevels()).append('\n');
        }
        if (table.missing() != TableOptions.Missing.REFUSE) {
            b.append("  missing: ").append(table.missing().key()).append('\n');
        }
        ModelSpec m = plan.model();
        b.append("model:\n");
        b.append("  kind: ").append(m.kind().key()).append('\n');
        if (m.kind() == ModelSpec.Kind.MLP) {
            b.append("  hidden: ").append(flow(m.hidden())).append('\n');
            b.append("  activation: ").append(m.activation().key()).append('\n');
        }
        b.append("  l2: ").append(number(m.l2())).append('\n');
        b.append("  init: ").append(m.init().name().toLowerCase(java.util.Locale.ROOT)).append('\n');
        TrainingSettings t = plan.training();
        b.append("training:\n");
        b.append("  epochs: ").append(t.epochs()).append('\n');
        b.append("  batch: ").append(t.batch()).append('\n');
        b.append("  sampling: ").append(t.sampling().key()).append('\n');
        b.append("  momentum: ").append(number(t.momentum())).append('\n');
        b.append("  tail: ").append(number(t.tail())).append('\n');
        b.append("  snapshots: ").append(t.snapshots()).append('\n');
    }

    /** Appends one arm's entry under {@code arms:}. */
    private static void arm(ArmPlan a, StringBuilder b) {
        b.append("  - name: ").append(scalar(a.name())).append('\n');
        b.append("    schedule: ").append(flow(a.schedule().settings())).append('\n');
        b.append("    average: ").append(a.average().yamlName()).append('\n');
        b.append("    manual: ").append(a.manual()).append('\n');
        if (!a.nudges().isEmpty()) {
            b.append("    nudges:\n");
            for (NudgeLog.Entry n : a.nudges()) {
                Map<String, Object> nudge = new java.util.LinkedHashMap<>();
                nudge.put("from", n.from());
                nudge.put("factor", n.factor());
                nudge.put("note", n.note());
                b.append("      - ").append(flow(nudge)).append('\n');
            }
        }
    }

    /**
     * Writes {@link #toYaml(Plan)} to {@code file} (a study directory's {@code plan.yaml}) atomically: into a
     * temporary file beside it, then renamed over it, so a reader never sees half a plan.
     *
     * @throws IOException when the file cannot be written
     */
    public static void write(Plan plan, Path file) throws IOException {
        AtomicFile.write(file, toYaml(plan));
    }

    /** @return the lower-case hexadecimal SHA-256 of the UTF-8 bytes of {@link #toYaml(Plan)} */
    public static String sha256(Plan plan) {
        return sha256(toYaml(plan));
    }

    /** @return the lower-case hexadecimal SHA-256 of the UTF-8 bytes of {@code text} */
    private static String sha256(String text) {
        try {
            MessageDigest digest = MessageDigest.getInstance("SHA-256");
            return HexFormat.of().formatHex(digest.digest(text.getBytes(StandardCharsets.UTF_8)));
        } catch (NoSuchAlgorithmException e) {
            throw new IllegalStateException("every Java platform has SHA-256", e);
        }
    }

    /** @return a value as one line of flow YAML: maps {@code {k: v, …}}, lists {@code [a, b]}, scalars */
    static String flow(Object value) {
        if (value instanceof Map<?, ?> map) {
            StringBuilder b = new StringBuilder("{");
            boolean first = true;
            for (Map.Entry<?, ?> e : map.entrySet()) {
                if (!first) {
                    b.append(", ");
                }
                first = false;
                b.append(scalar(String.valueOf(e.getKey()))).append(": ").append(flow(e.getValue()));
            }
            return b.append('}').toString();
        }
        if (value instanceof List<?> list) {
            StringBuilder b = new StringBuilder("[");
            for (int i = 0; i < list.size(); i++) {
                if (i > 0) {
                    b.append(", ");
                }
                b.append(flow(list.get(i)));
            }
            return b.append(']').toString();
        }
        if (value == null) {
            return "null";
        }
        if (value instanceof Double || value instanceof Float) {
            return number(((Number) value).doubleValue());
        }
        if (value instanceof Number || value instanceof Boolean) {
            return value.toString();
        }
        return scalar(value.toString());
    }

    /** @return a finite double in Java's shortest round-trip form, which always has a point or exponent */
    static String number(double v) {
        if (!Double.isFinite(v)) {
            throw new IllegalArgumentException("a plan holds finite numbers only: " + v);
        }
        return Double.toString(v);
    }

    /** @return the string plain when YAML reads it back unchanged as a string, else double-quoted */
    static String scalar(String s) {
        if (PLAIN.matcher(s).matches() && !RESERVED.matcher(s).matches()) {
            return s;
        }
        StringBuilder b = new StringBuilder("\"");
        for (int i = 0; i < s.length(); i++) {
            char c = s.charAt(i);
            switch (c) {
                case '"' -> b.append("\\\"");
                case '\\' -> b.append("\\\\");
                case '\n' -> b.append("\\n");
                case '\t' -> b.append("\\t");
                case '\r' -> b.append("\\r");
                default -> {
                    if (c < 0x20 || c == 0x7f || (c >= 0x80 && c <= 0x9f) || c == 0x2028 || c == 0x2029
                            || c == 0xfeff) {
                        b.append(String.format("\\u%04x", (int) c));
                    } else {
                        b.append(c);
                    }
                }
            }
        }
        return b.append('"').toString();
    }
}
