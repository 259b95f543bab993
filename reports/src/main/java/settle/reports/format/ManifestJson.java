package settle.reports.format;

import com.fasterxml.jackson.core.JsonGenerator;
import java.io.IOException;
import java.util.ArrayList;
import java.util.List;
import settle.input.BadInputException;
import settle.reports.format.JsonIn.Obj;
import settle.reports.format.JsonIn.Range;

/**
 * {@code manifest.json}: its one writer and its one reader (README, "Study directory"). Reading checks every field:
 * present, of its type and in its range; the names and counts of the data; arms listed in index order with their
 * directories; the grid's structure; and every replicate of every arm listed exactly once with its status.
 */
public final class ManifestJson {

    private ManifestJson() {
    }

    /** @return the file's bytes */
    public static byte[] write(Manifest m) {
        return JsonOut.document(g -> {
            g.writeStartObject();
            g.writeNumberField("format", StudyFormat.VERSION);
            g.writeStringField("study", m.study());
            g.writeObjectFieldStart("tool");
            g.writeStringField("name", m.tool().name());
            g.writeStringField("version", m.tool().version());
            g.writeStringField("git_commit", m.tool().gitCommit());
            g.writeEndObject();
            g.writeObjectFieldStart("jvm");
            g.writeStringField("vendor", m.runtime().vendor());
            g.writeStringField("name", m.runtime().name());
            g.writeStringField("version", m.runtime().version());
            g.writeEndObject();
            g.writeObjectFieldStart("cpu");
            g.writeStringField("model", m.processor().model());
            g.writeStringField("arch", m.processor().arch());
            g.writeNumberField("cores", m.processor().cores());
            g.writeEndObject();
            g.writeStringField("executor", m.executor());
            g.writeNumberField("threads", m.threads());
            JsonOut.strings(g, "command", m.command());
            g.writeStringField("generator", m.generator());
            g.writeNumberField("root_seed", m.rootSeed());
            g.writeStringField("started", m.started());
            JsonOut.text(g, "ended", m.endedAt());
            g.writeStringField("plan_sha256", m.planSha256());
            g.writeStringField("data_sha256", m.dataSha256());
            g.writeStringField("split_sha256", m.splitSha256());
            g.writeStringField("settings_sha256", m.settingsSha256());
            Manifest.Data d = m.data();
            g.writeObjectFieldStart("data");
            g.writeStringField("source", d.source());
            g.writeNumberField("rows", d.rows());
            g.writeNumberField("features", d.features());
            JsonOut.strings(g, "feature_names", d.featureNames());
            JsonOut.strings(g, "class_names", d.classNames());
            g.writeNumberField("train_rows", d.trainRows());
            g.writeNumberField("test_rows", d.testRows());
            g.writeNumberField("holdout_rows", d.holdoutRows());
            g.writeNumberField("updates_per_epoch", d.updatesPerEpoch());
            g.writeEndObject();
            Manifest.Standardisation s = m.standardisation();
            if (s == null) {
                g.writeNullField("standardisation");
            } else {
                g.writeObjectFieldStart("standardisation");
                JsonOut.array(g, "means", s.means());
                JsonOut.array(g, "scales", s.scales());
                g.writeEndObject();
            }
            g.writeStringField("model", m.model());
            g.writeNumberField("parameters", m.parameters());
            g.writeNumberField("model_l2", m.l2());
            Manifest.Training t = m.training();
            g.writeObjectFieldStart("training");
            g.writeNumberField("epochs", t.epochs());
            g.writeNumberField("batch", t.batch());
            g.writeStringField("sampling", t.sampling());
            JsonOut.number(g, "momentum", t.momentum());
            JsonOut.number(g, "tail", t.tail());
            g.writeNumberField("snapshots", t.snapshots());
            g.writeEndObject();
            g.writeStringField("reference", m.reference());
            g.writeStringField("baseline", m.baseline());
            g.writeArrayFieldStart("arms");
            for (int a = 0; a < m.arms().size(); a++) {
                g.writeStartObject();
                g.writeNumberField("index", a + 1);
                g.writeStringField("name", m.arms().get(a));
                g.writeStringField("id", m.armIds().get(a));
                g.writeStringField("directory", StudyFormat.ARMS + "/" + m.armIds().get(a));
                g.writeEndObject();
            }
            g.writeEndArray();
            writeGrids(g, m.grids());
            g.writeArrayFieldStart("replicates");
            for (Manifest.Status r : m.statuses()) {
                g.writeStartObject();
                g.writeNumberField("arm", r.arm());
                g.writeNumberField("replicate", r.replicate());
                g.writeStringField("status", r.status());
                g.writeEndObject();
            }
            g.writeEndArray();
            g.writeEndObject();
        });
    }

    /**
     * The manifest's {@code grid}: per grid entry of the plan, the template arm, the swept keys with their values as
     * written, and each expanded arm's index (from 1) with its value of each key; an empty array without a grid.
     */
    private static void writeGrids(JsonGenerator g, List<Grid> grids) throws IOException {
        g.writeArrayFieldStart("grid");
        for (Grid grid : grids) {
            g.writeStartObject();
            g.writeStringField("arm", grid.arm());
            g.writeArrayFieldStart("keys");
            for (int k = 0; k < grid.keys().size(); k++) {
                g.writeStartObject();
                g.writeStringField("name", grid.keys().get(k));
                JsonOut.strings(g, "values", grid.values().get(k));
                g.writeEndObject();
            }
            g.writeEndArray();
            g.writeArrayFieldStart("arms");
            for (Grid.Member e : grid.members()) {
                g.writeStartObject();
                g.writeNumberField("index", e.arm() + 1);
                JsonOut.strings(g, "values", e.values());
                g.writeEndObject();
            }
            g.writeEndArray();
            g.writeEndObject();
        }
        g.writeEndArray();
    }

    /**
     * Reads and checks {@code manifest.json}.
     *
     * @param bytes the file's content
     * @param file the file as messages name it
     * @param rerun the command that rewrites the study in this format, for the refusal of an older one
     * @return the manifest
     * @throws BadInputException naming the file and the key, for a manifest in another format or with a field
     *     missing, of another type or out of its range
     */
    public static Manifest read(byte[] bytes, String file, String rerun) {
        Obj m = thisFormat(bytes, file, rerun);
        for (String key : new String[] {"study", "model_l2", "training", "grid"}) {
            if (!m.has(key)) {
                throw m.problem(key, "missing (the manifest records the study's name, model_l2, training and grid for"
                        + " the report"
                        + " since this settle); run the study's plan again with settle run PLAN --out "
                        + java.nio.file.Path.of(file).toAbsolutePath().getParent() + " to rewrite it: its finished"
                        + " replicates are kept");
            }
        }
        String study = m.text("study");
        if (study.isBlank()) {
            throw m.problem("study", "is empty; expected the study's name");
        }
        Obj t = m.object("tool");
        Manifest.Tool tool = new Manifest.Tool(t.text("name"), t.text("version"), t.text("git_commit"));
        Obj j = m.object("jvm");
        Manifest.Jvm jvm = new Manifest.Jvm(j.text("vendor"), j.text("name"), j.text("version"));
        Obj c = m.object("cpu");
        Manifest.Cpu cpu = new Manifest.Cpu(c.text("model"), c.text("arch"), c.integer("cores", 1, Integer.MAX_VALUE));
        String executor = m.text("executor");
        int threads = m.integer("threads", 1, Integer.MAX_VALUE);
        List<String> command = m.texts("command");
        String generator = m.text("generator");
        long rootSeed = m.whole("root_seed", Long.MIN_VALUE, Long.MAX_VALUE);
        String started = m.text("started");
        String ended = m.textOrNull("ended");
        String planHash = m.text("plan_sha256");
        String dataHash = m.text("data_sha256");
        String splitHash = m.text("split_sha256");
        Manifest.Data data = data(m.object("data"));
        Manifest.Standardisation standardisation = null;
        Obj s = m.objectOrNull("standardisation");
        if (s != null) {
            standardisation = new Manifest.Standardisation(s.numbers("means", data.features(), Range.ANY, false),
                    s.numbers("scales", data.features(), Range.POSITIVE, false));
        }
        String model = m.text("model");
        int parameters = m.integer("parameters", 1, Integer.MAX_VALUE);
        double l2 = m.number("model_l2", Range.NON_NEGATIVE);
        Manifest.Training training = training(m.object("training"));
        String reference = m.text("reference");
        String settingsHash = m.text("settings_sha256");
        List<String> arms = new ArrayList<>();
        List<String> armIds = new ArrayList<>();
        List<Obj> armList = m.objects("arms");
        if (armList.isEmpty()) {
            throw m.problem("arms", "is empty; a study has at least one arm");
        }
        for (int i = 0; i < armList.size(); i++) {
            Obj arm = armList.get(i);
            int index = arm.integer("index", Integer.MIN_VALUE, Integer.MAX_VALUE);
            if (index != i + 1) {
                throw arm.problem("index", "is " + index + "; expected " + (i + 1) + " (arms are listed in index order"
                        + " from 1)");
            }
            arms.add(arm.text("name"));
            String id = arm.text("id");
            if (!StudyFormat.isArmId(id)) {
                throw arm.problem("id", "is " + BadInputException.shown(id) + "; expected the arm's name made safe for a"
                        + " file name, '-' and 12 hexadecimal digits");
            }
            if (armIds.contains(id)) {
                throw arm.problem("id", "is " + BadInputException.shown(id) + ", the id of arm " + (armIds.indexOf(id) + 1)
                        + " too; every arm has its own");
            }
            armIds.add(id);
            String directory = arm.text("directory");
            if (!directory.equals(StudyFormat.ARMS + "/" + id)) {
                throw arm.problem("directory", "is " + BadInputException.shown(directory) + "; arm " + (i + 1)
                        + "'s replicate files are in " + StudyFormat.ARMS + "/" + BadInputException.shown(id));
            }
        }
        String baseline = m.text("baseline");
        if (!arms.contains(baseline)) {
            throw m.problem("baseline", BadInputException.shown(baseline) + " is not one of the arms");
        }
        List<Grid> grids = grids(m, arms.size());
        List<Manifest.Status> statuses = statuses(m, arms.size());
        return new Manifest(StudyFormat.VERSION, study, tool, jvm, cpu, executor, threads, command, generator, rootSeed, started,
                ended, planHash, dataHash, splitHash, settingsHash, data, standardisation, model, parameters, l2,
                training, reference, baseline, arms, armIds, grids, statuses);
    }

    /**
     * What a run that resumes a study needs from the manifest an earlier run wrote: the hashes it compares with its
     * own, and the grid it keeps when the plan it runs has none (the study's own plan.yaml has its grid expanded).
     *
     * @param planSha256 SHA-256 of the earlier resolved plan
     * @param dataSha256 SHA-256 of its data
     * @param splitSha256 SHA-256 of its split
     * @param settingsSha256 SHA-256 of its shared settings ({@link Manifest#settingsSha256})
     * @param grids the grid it recorded; empty when it recorded none, or one this settle cannot read
     */
    public record Earlier(String planSha256, String dataSha256, String splitSha256, String settingsSha256,
            List<Grid> grids) {
    }

    /**
     * @return the manifest's JSON object, once its {@code format} is this settle's (an older one is refused with how
     *     to rewrite it, a newer or unknown one as not supported)
     */
    private static Obj thisFormat(byte[] bytes, String file, String rerun) {
        Obj m = JsonIn.read(bytes, file);
        int format = m.integer("format", Integer.MIN_VALUE, Integer.MAX_VALUE);
        if (format < StudyFormat.VERSION) {
            throw StudyFormat.olderFormat(java.nio.file.Path.of(file), format, rerun);
        }
        if (format != StudyFormat.VERSION) {
            throw m.problem("format", "study directory format " + format + " is not supported; this settle reads format "
                    + StudyFormat.VERSION);
        }
        return m;
    }

    /**
     * Reads what a resumed run needs from an earlier run's manifest. Only these keys are required, so that a
     * manifest of format 2 written before the study's name, λ and grid were recorded is rewritten, not refused.
     *
     * @param rerun the command that rewrites the study in this format, for the refusal of an older one
     * @throws BadInputException for a manifest in an older format, not JSON, or without the hashes
     */
    public static Earlier earlier(byte[] bytes, String file, String rerun) {
        Obj m = thisFormat(bytes, file, rerun);
        List<Grid> grids;
        try {
            grids = m.has("grid") ? grids(m, m.objects("arms").size()) : List.of();
        } catch (BadInputException e) {
            grids = List.of(); // not this settle's grid record: nothing to keep
        }
        return new Earlier(m.text("plan_sha256"), m.text("data_sha256"), m.text("split_sha256"),
                m.text("settings_sha256"), grids);
    }

    /**
     * The manifest's {@code training}: {@code epochs} and {@code batch} (whole numbers ≥ 1), {@code sampling} (one of
     * {@link Manifest.Training#SAMPLINGS}), {@code momentum} in [0, 1), {@code tail} in (0, 1], {@code snapshots}
     * (a whole number ≥ 1).
     */
    private static Manifest.Training training(Obj t) {
        return new Manifest.Training(t.integer("epochs", 1, Integer.MAX_VALUE), t.integer("batch", 1, Integer.MAX_VALUE),
                t.choice("sampling", Manifest.Training.SAMPLINGS.toArray(new String[0])),
                t.number("momentum", Range.MOMENTUM), t.number("tail", Range.TAIL),
                t.integer("snapshots", 1, Integer.MAX_VALUE));
    }

    private static Manifest.Data data(Obj d) {
        String source = d.text("source");
        int rows = d.integer("rows", 1, Integer.MAX_VALUE);
        int features = d.integer("features", 1, Integer.MAX_VALUE);
        List<String> featureNames = d.texts("feature_names");
        if (featureNames.size() != features) {
            throw d.problem("feature_names", "lists " + featureNames.size() + " names for " + features + " features");
        }
        List<String> classNames = d.texts("class_names");
        if (classNames.size() < 2) {
            throw d.problem("class_names", "lists " + classNames.size() + " classes; a study has at least 2");
        }
        int train = d.integer("train_rows", 1, rows);
        int test = d.integer("test_rows", 1, rows);
        int holdout = d.integer("holdout_rows", 0, rows);
        if ((long) train + test + holdout != rows) {
            throw d.problem("rows", "is " + rows + "; the training, test and holdout rows add up to "
                    + ((long) train + test + holdout));
        }
        return new Manifest.Data(source, rows, features, featureNames, classNames, train, test, holdout,
                d.integer("updates_per_epoch", 1, Integer.MAX_VALUE));
    }

    /**
     * The manifest's {@code grid}: per grid entry of the plan, {@code arm} (the template's name), {@code keys}
     * [{@code name}, {@code values} [strings]] and {@code arms} [{@code index} (from 1), {@code values} [one string per
     * key, each one of that key's values]]; an arm belongs to at most one entry.
     */
    private static List<Grid> grids(Obj m, int armCount) {
        List<Grid> out = new ArrayList<>();
        boolean[] taken = new boolean[armCount];
        for (Obj g : m.objects("grid")) {
            String arm = g.text("arm");
            List<Obj> keyList = g.objects("keys");
            if (keyList.isEmpty()) {
                throw g.problem("keys", "is empty; a grid sweeps at least one key");
            }
            List<String> keys = new ArrayList<>();
            List<List<String>> values = new ArrayList<>();
            for (Obj key : keyList) {
                keys.add(key.text("name"));
                List<String> written = key.texts("values");
                if (written.isEmpty()) {
                    throw key.problem("values", "is empty; a swept key has at least one value");
                }
                values.add(written);
            }
            List<Obj> memberList = g.objects("arms");
            if (memberList.isEmpty()) {
                throw g.problem("arms", "is empty; a grid expands into at least one arm");
            }
            List<Grid.Member> members = new ArrayList<>();
            for (Obj member : memberList) {
                int index = member.integer("index", 1, armCount);
                if (taken[index - 1]) {
                    throw member.problem("index", index + " is already listed by a grid; an arm comes from at most one"
                            + " grid entry");
                }
                taken[index - 1] = true;
                List<String> chosen = member.texts("values");
                if (chosen.size() != keys.size()) {
                    throw member.problem("values", "has " + chosen.size() + " values; the grid sweeps " + keys.size()
                            + " keys");
                }
                for (int k = 0; k < keys.size(); k++) {
                    if (!values.get(k).contains(chosen.get(k))) {
                        throw member.problem("values[" + k + "]", "is " + BadInputException.shown(chosen.get(k))
                                + ", not one of the values of " + BadInputException.shown(keys.get(k)));
                    }
                }
                members.add(new Grid.Member(index - 1, chosen));
            }
            out.add(new Grid(arm, keys, values, members));
        }
        return out;
    }

    /** @return the replicates' statuses: replicates 1..R of every arm, each listed once, arm by arm */
    private static List<Manifest.Status> statuses(Obj m, int arms) {
        List<Obj> list = m.objects("replicates");
        if (list.isEmpty() || list.size() % arms != 0) {
            throw m.problem("replicates", "lists " + list.size() + " replicates; expected the same number (at least"
                    + " one) for each of the " + arms + " arms");
        }
        int count = list.size() / arms;
        List<Manifest.Status> out = new ArrayList<>();
        for (int i = 0; i < list.size(); i++) {
            Obj r = list.get(i);
            int arm = r.integer("arm", i / count + 1, i / count + 1);
            int replicate = r.integer("replicate", i % count + 1, i % count + 1);
            out.add(new Manifest.Status(arm, replicate, r.choice("status", Replicate.FINISHED, Replicate.DIVERGED,
                    Manifest.PENDING, Manifest.MISSING)));
        }
        return out;
    }
}
