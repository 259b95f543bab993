package settle.experiments.manual;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.node.ObjectNode;
import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.time.Instant;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Optional;
import java.util.concurrent.ThreadLocalRandom;
import settle.input.BadInputException;
import settle.reports.format.AtomicFile;
import settle.reports.format.StudyFormat;

/**
 * The control channel of a running study: the folder {@code .nudge/} in its study directory, one JSON file
 * per request, each written atomically (temporary file, then rename), so a reader never sees half a request
 * and two writers never collide. A request stays until the runner has recorded it in {@code nudges.csv}
 * and then deletes it, so a crash between asking and applying loses nothing; the runner skips a request
 * whose id {@code nudges.csv} already holds (a crash between recording and deleting applies it once).
 * A request the runner cannot apply is replaced by {@code <id>.refused}, holding the reason.
 */
public final class NudgeQueue {

    /** The queue's folder inside a study directory. */
    public static final String FOLDER = StudyFormat.NUDGE_QUEUE;

    private static final ObjectMapper MAPPER = new ObjectMapper();
    private static final String REQUEST = ".json";
    private static final String REFUSED = ".refused";

    private NudgeQueue() {
    }

    /** @return the queue folder of {@code study} */
    public static Path folder(Path study) {
        return study.resolve(FOLDER);
    }

    /**
     * Writes a request into the queue.
     *
     * @param factor the multiplier, or NaN
     * @param rate the target rate, or NaN
     * @return the request as written (its id names its file)
     * @throws BadInputException unless exactly one of factor and rate is given, positive and finite
     */
    public static NudgeRequest submit(Path study, String arm, double factor, double rate, String note)
            throws IOException {
        Instant now = Instant.now();
        String id = String.format(Locale.ROOT, "%019d-%d-%08x", now.getEpochSecond() * 1_000_000_000L + now.getNano(),
                ProcessHandle.current().pid(), ThreadLocalRandom.current().nextInt());
        NudgeRequest request = new NudgeRequest(id, arm, factor, rate, note, now.toString());
        ObjectNode o = MAPPER.createObjectNode();
        o.put("id", id);
        o.put("arm", arm);
        if (request.byFactor()) {
            o.put("factor", factor);
        } else {
            o.put("rate", rate);
        }
        o.put("note", request.note());
        o.put("asked", request.asked());
        AtomicFile.write(folder(study).resolve(id + REQUEST), MAPPER.writerWithDefaultPrettyPrinter()
                .writeValueAsString(o) + "\n");
        return request;
    }

    /** A request file that could not be read as a request. */
    public record Unreadable(String id, String reason) {
    }

    /** The queue's content at one moment, in id order. */
    public record Pending(List<NudgeRequest> requests, List<Unreadable> unreadable) {
    }

    /** @return the requests waiting in the queue, in id order; files that are not requests listed apart */
    public static Pending pending(Path study) throws IOException {
        Path dir = folder(study);
        List<NudgeRequest> out = new ArrayList<>();
        List<Unreadable> bad = new ArrayList<>();
        if (!Files.isDirectory(dir)) {
            return new Pending(out, bad);
        }
        List<Path> files = new ArrayList<>();
        try (var entries = Files.newDirectoryStream(dir, "*" + REQUEST)) {
            for (Path p : entries) {
                if (!p.getFileName().toString().startsWith(".")) {
                    files.add(p);
                }
            }
        }
        files.sort(null);
        for (Path p : files) {
            String name = p.getFileName().toString();
            String id = name.substring(0, name.length() - REQUEST.length());
            try {
                JsonNode n = MAPPER.readTree(Files.readString(p, StandardCharsets.UTF_8));
                double factor = n.has("factor") ? n.path("factor").asDouble(Double.NaN) : Double.NaN;
                double rate = n.has("rate") ? n.path("rate").asDouble(Double.NaN) : Double.NaN;
                if (!n.path("arm").isTextual()) {
                    throw BadInputException.of("arm", "no arm named in it");
                }
                out.add(new NudgeRequest(id, n.path("arm").asText(), factor, rate, n.path("note").asText(""),
                        n.path("asked").asText("")));
            } catch (NoSuchFileException e) {
                // taken by the runner meanwhile
            } catch (IOException | BadInputException e) {
                // say what is wrong in our words: the JSON parser's name its own internals
                bad.add(new Unreadable(id, "not a nudge request: " + (e instanceof BadInputException
                        ? e.getMessage() : "not the JSON settle nudge writes")));
            }
        }
        return new Pending(out, bad);
    }

    /** Removes an applied request. */
    public static void remove(Path study, String id) throws IOException {
        Files.deleteIfExists(folder(study).resolve(id + REQUEST));
    }

    /** Replaces request {@code id} by its refusal, holding {@code reason} (one line). */
    public static void refuse(Path study, String id, String reason) throws IOException {
        AtomicFile.write(folder(study).resolve(id + REFUSED), reason + "\n");
        remove(study, id);
    }

    /** @return the refusal of request {@code id}, when the runner refused it */
    public static Optional<String> refusal(Path study, String id) throws IOException {
        Path p = folder(study).resolve(id + REFUSED);
        if (!Files.exists(p)) {
            return Optional.empty();
        }
        return Optional.of(Files.readString(p, StandardCharsets.UTF_8).strip());
    }

    /** Empties the queue (a fresh run), refusals included. */
    public static void clear(Path study) throws IOException {
        Path dir = folder(study);
        if (!Files.isDirectory(dir)) {
            return;
        }
        try (var entries = Files.newDirectoryStream(dir)) {
            for (Path p : entries) {
                Files.deleteIfExists(p);
            }
        }
    }
}
