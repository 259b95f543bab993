package settle.experiments.plan;

import static settle.input.BadInputException.shown;

import com.fasterxml.jackson.core.JsonLocation;
import com.fasterxml.jackson.core.JsonParser;
import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.core.JsonToken;
import com.fasterxml.jackson.dataformat.yaml.YAMLFactory;
import com.fasterxml.jackson.dataformat.yaml.YAMLParser;
import java.io.IOException;
import java.math.BigInteger;
import java.util.ArrayDeque;
import java.util.Deque;
import org.yaml.snakeyaml.error.Mark;
import org.yaml.snakeyaml.error.MarkedYAMLException;
import settle.input.BadInputException;

/**
 * Reads one YAML document into a {@link YamlNode} tree that keeps every position, through Jackson's
 * streaming YAML parser (which reports token positions). Duplicate keys are detected here, at the
 * duplicate key's own position (Jackson's {@code STRICT_DUPLICATE_DETECTION} reports the column after it);
 * aliases are refused (Jackson would hand back the alias name as a string); syntax errors are reported at
 * SnakeYAML's problem mark, or at the opening bracket of an unclosed flow collection.
 */
final class YamlReader {

    private static final YAMLFactory FACTORY = YAMLFactory.builder().build();

    private final String file;

    private YamlReader(String file) {
        this.file = file;
    }

    /**
     * @param text the whole file
     * @param file the file name used in messages
     * @return the root node, never null
     * @throws BadInputException on a syntax error, a duplicate key, an alias, an empty file or a second document
     */
    static YamlNode read(String text, String file) {
        return new YamlReader(file).parse(text);
    }

    private YamlNode parse(String text) {
        Deque<String> path = new ArrayDeque<>();
        try (JsonParser p = FACTORY.createParser(text)) {
            JsonToken t = p.nextToken();
            if (t == null) {
                throw BadInputException.at(file, 1, 1, "", "the plan is empty; expected a map with at least "
                        + "'data', 'arms' (and usually 'study', 'seed', 'replicates', 'model', 'training')");
            }
            YamlNode root = readValue(p, t, path);
            JsonToken next = p.nextToken();
            if (next != null) {
                JsonLocation l = p.currentTokenLocation();
                throw BadInputException.at(file, l.getLineNr(), l.getColumnNr(), "",
                        "a plan file holds one YAML document; found a second one (remove the '---' separator)");
            }
            return root;
        } catch (JsonProcessingException e) {
            throw syntaxError(e, path);
        } catch (IOException e) {
            throw BadInputException.at(file, 0, 0, "", "cannot read: " + e.getMessage());
        }
    }

    private YamlNode readValue(JsonParser p, JsonToken t, Deque<String> path) throws IOException {
        JsonLocation l = p.currentTokenLocation();
        int line = l.getLineNr();
        int column = l.getColumnNr();
        if (path.size() > MAX_DEPTH) {
            throw BadInputException.at(file, line, column, render(path), "nested more than " + MAX_DEPTH + " levels"
                    + " deep; a plan nests a few levels (arms, schedule, warmup), so a bracket may be unclosed here");
        }
        if (p instanceof YAMLParser y && y.isCurrentAlias()) {
            throw BadInputException.at(file, line, column, render(path),
                    "YAML aliases (*name) are not supported in a plan; write the value out");
        }
        switch (t) {
            case START_OBJECT: {
                YamlNode.MapNode map = new YamlNode.MapNode(line, column);
                JsonToken k;
                while ((k = p.nextToken()) == JsonToken.FIELD_NAME) {
                    String key = p.currentName();
                    JsonLocation kl = p.currentTokenLocation();
                    path.addLast(path.isEmpty() ? key : "." + key);
                    if (map.entries.containsKey(key)) {
                        YamlNode.Entry first = map.entries.get(key);
                        throw BadInputException.at(file, kl.getLineNr(), kl.getColumnNr(), render(path),
                                "duplicate key '" + key + "' (first at line " + first.keyLine
                                        + "); remove one of them: each key may appear once in a map");
                    }
                    YamlNode value = readValue(p, p.nextToken(), path);
                    map.entries.put(key, new YamlNode.Entry(key, kl.getLineNr(), kl.getColumnNr(), value));
                    path.removeLast();
                }
                return map;
            }
            case START_ARRAY: {
                YamlNode.ListNode list = new YamlNode.ListNode(line, column);
                JsonToken v;
                int i = 0;
                while ((v = p.nextToken()) != JsonToken.END_ARRAY) {
                    path.addLast("[" + i + "]");
                    list.items.add(readValue(p, v, path));
                    path.removeLast();
                    i++;
                }
                return list;
            }
            case VALUE_STRING: {
                String s = p.getText();
                if (s.isEmpty()) {
                    return new YamlNode.Scalar(line, column, YamlNode.ScalarType.NULL, "", null);
                }
                return new YamlNode.Scalar(line, column, YamlNode.ScalarType.STRING, s, s);
            }
            case VALUE_NUMBER_INT: {
                String s = p.getText();
                BigInteger v = p.getBigIntegerValue();
                return new YamlNode.Scalar(line, column, YamlNode.ScalarType.INTEGER, s, v);
            }
            case VALUE_NUMBER_FLOAT:
                return new YamlNode.Scalar(line, column, YamlNode.ScalarType.FLOAT, p.getText(), p.getDoubleValue());
            case VALUE_TRUE:
            case VALUE_FALSE:
                return new YamlNode.Scalar(line, column, YamlNode.ScalarType.BOOLEAN, p.getText(),
                        t == JsonToken.VALUE_TRUE);
            case VALUE_NULL:
                return new YamlNode.Scalar(line, column, YamlNode.ScalarType.NULL, p.getText(), null);
            case VALUE_EMBEDDED_OBJECT:
                throw BadInputException.at(file, line, column, render(path), "binary data (!!binary) is not accepted in"
                        + " a plan; write the value as text or a number");
            default:
                throw BadInputException.at(file, line, column, render(path), "this YAML is not accepted in a plan;"
                        + " write plain 'key: value' lines, lists and maps");
        }
    }

    /** Deeper than any plan nests (arms[0].schedule.points[0] is 4 levels); far below the parser's own limit. */
    private static final int MAX_DEPTH = 64;

    private static String render(Deque<String> path) {
        return String.join("", path);
    }

    /** SnakeYAML's "but got :" names the token bare; quote it. */
    private static String found(String problem) {
        return problem.replaceAll("but got ([^<\\s]\\S*)$", "but found '$1'").replace("but got <", "but found <");
    }

    /** Plain words for SnakeYAML's most common problems. */
    private static String explain(String problem) {
        if (problem.contains("(TAB)")) {
            return "a tab character; indent with spaces, not tabs";
        }
        if (problem.startsWith("mapping values are not allowed here")) {
            return "a ':' where none is allowed; check the indentation of this line, and quote a value that "
                    + "contains ': '";
        }
        if (problem.startsWith("expected <block end>")) {
            return "this line is indented differently from the keys above it; keys of one map start at the "
                    + "same column, and nested keys are indented with spaces under their parent";
        }
        return found(problem) + "; a plan is a map of 'key: value' lines, nested by indenting with spaces";
    }

    private BadInputException syntaxError(JsonProcessingException e, Deque<String> path) {
        Throwable c = e;
        while (c != null && !(c instanceof MarkedYAMLException)) {
            c = c.getCause();
        }
        if (c instanceof MarkedYAMLException m) {
            Mark problem = m.getProblemMark();
            Mark context = m.getContextMark();
            String what = m.getProblem() == null ? "syntax error" : m.getProblem();
            String contextText = m.getContext();
            if (context != null && contextText != null && contextText.contains("flow")) {
                // An unclosed '[' or '{' swallows what follows; the bracket is the place to fix.
                boolean sequence = contextText.contains("sequence");
                return BadInputException.at(file, context.getLine() + 1, context.getColumn() + 1, render(path),
                        "YAML syntax: '" + (sequence ? "[" : "{") + "' is not closed (" + found(what)
                                + " at line " + (problem.getLine() + 1) + ", column " + (problem.getColumn() + 1)
                                + "); close it with '" + (sequence ? "]" : "}") + "', and quote values that "
                                + "contain ':', '?', ',', '[' or '{'");
            }
            if (problem != null) {
                return BadInputException.at(file, problem.getLine() + 1, problem.getColumn() + 1, render(path),
                        "YAML syntax: " + explain(what));
            }
        }
        JsonLocation l = e.getLocation();
        return BadInputException.at(file, l == null ? 0 : l.getLineNr(), l == null ? 0 : l.getColumnNr(),
                render(path), "YAML syntax: " + plain(String.valueOf(e.getOriginalMessage())));
    }

    /** The parser's own words name its internals (event classes, feature flags): say what is wrong in ours. */
    private static String plain(String message) {
        if (message.startsWith("Expected a field name")) {
            return "a key must be plain text, not a list or a map; write 'key: value'";
        }
        if (message.startsWith("Malformed numeric value")) {
            int q = message.indexOf('\'');
            int r = q < 0 ? -1 : message.indexOf('\'', q + 1);
            return (r > q ? shown(message.substring(q + 1, r)) + " is" : "this is") + " not a finite number; write a"
                    + " number such as 0.1 (a plan holds no NaN or infinity)";
        }
        if (message.contains("nesting depth")) {
            return "nested too deep; a plan nests a few levels (arms, schedule, warmup), so a bracket may be unclosed";
        }
        return "this is not valid YAML here; a plan is a map of 'key: value' lines, nested by indenting with spaces";
    }
}
