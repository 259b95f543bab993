package settle.reports.format;

import com.fasterxml.jackson.core.JsonFactory;
import com.fasterxml.jackson.core.JsonLocation;
import com.fasterxml.jackson.core.JsonParser;
import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.core.JsonToken;
import com.fasterxml.jackson.core.StreamReadFeature;
import com.fasterxml.jackson.core.exc.StreamConstraintsException;
import com.fasterxml.jackson.core.io.JsonEOFException;
import java.io.IOException;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import settle.input.BadInputException;

/**
 * Reads the study directory's JSON files into a small tree and checks every field on the way out.
 *
 * <p>The tree is made for study files: an array of numbers (and nulls) becomes one {@link NumberArray} (a
 * {@code double[]}) instead of a node per element. Objects are {@code Map<String, Object>} in file order; other
 * arrays {@code List<Object>}; whole numbers {@link Long} (beyond the long range {@link Double}), other numbers
 * {@link Double}; strings, booleans; JSON null is {@link #NULL}. Duplicate keys are refused.
 *
 * <p>{@link Obj} gives typed access: each getter checks that the key is there, of its type and in its range, and
 * otherwise throws a {@link BadInputException} naming the file and the key path ({@code metrics.tail_radius}) and what
 * would be accepted. A file that is not JSON is refused with its line and column, in words, never the parser's.
 */
final class JsonIn {

    /** JSON null. */
    static final Object NULL = new Object() {
        @Override
        public String toString() {
            return "null";
        }
    };

    /**
     * An array whose elements are all numbers or null.
     *
     * @param values the numbers, NaN where the array holds null
     * @param firstNull the index of the first null, or −1
     */
    record NumberArray(double[] values, int firstNull) {
        @Override
        public String toString() {
            return "an array of " + values.length + " numbers";
        }
    }

    private static final JsonFactory FACTORY = JsonFactory.builder()
            .enable(StreamReadFeature.USE_FAST_DOUBLE_PARSER)
            .enable(StreamReadFeature.STRICT_DUPLICATE_DETECTION).build();

    private JsonIn() {
    }

    /**
     * @param bytes a JSON file's content
     * @param file the file as messages name it
     * @return the root object
     * @throws BadInputException for an empty file, malformed JSON or a root that is not an object
     */
    static Obj read(byte[] bytes, String file) {
        try (JsonParser p = FACTORY.createParser(bytes)) {
            JsonToken t = p.nextToken();
            if (t == null) {
                throw BadInputException.inFile(file, "", "the file is empty; expected a JSON object");
            }
            Object root = value(p, t);
            if (p.nextToken() != null) {
                JsonLocation l = p.currentTokenLocation();
                throw BadInputException.at(file, l.getLineNr(), l.getColumnNr(), "", "more after the JSON object;"
                        + " expected one object");
            }
            if (!(root instanceof Map)) {
                throw BadInputException.inFile(file, "", "expected a JSON object, found " + show(root));
            }
            return new Obj(file, "", cast(root));
        } catch (JsonProcessingException e) {
            JsonLocation l = e.getLocation();
            throw BadInputException.at(file, l == null ? 0 : l.getLineNr(), l == null ? 0 : l.getColumnNr(), "",
                    "not valid JSON: " + describe(e));
        } catch (IOException e) {
            throw new java.io.UncheckedIOException(e);
        }
    }

    /** @return what is wrong with a file that is not JSON, in words (the parser's message names its own internals) */
    private static String describe(JsonProcessingException e) {
        String m = String.valueOf(e.getOriginalMessage());
        if (e instanceof JsonEOFException || m.contains("end-of-input")) {
            return "the file ends in the middle of a value (it was cut short)";
        }
        if (e instanceof StreamConstraintsException) {
            return m.contains("nesting") ? "it nests deeper than a study file ever does"
                    : "a number or a string longer than a study file ever holds";
        }
        if (m.contains("Duplicate field")) {
            int q = m.indexOf('\'');
            int r = q < 0 ? -1 : m.indexOf('\'', q + 1);
            return "a key appears twice in one object" + (r > q ? " (" + BadInputException.shown(m.substring(q + 1, r))
                    + ")" : "");
        }
        if (m.contains("Non-standard token")) {
            return "it holds NaN or Infinity, which JSON does not allow (settle writes null for them)";
        }
        if (m.contains("CTRL-CHAR")) {
            int code = m.indexOf("code ");
            String which = "";
            if (code >= 0) {
                int end = code + 5;
                while (end < m.length() && Character.isDigit(m.charAt(end))) {
                    end++;
                }
                try {
                    int c = Integer.parseInt(m.substring(code + 5, end));
                    which = c == 0 ? " (a NUL byte)" : String.format(" (U+%04X)", c);
                } catch (NumberFormatException x) {
                    which = "";
                }
            }
            return "it holds a control character" + which + " where JSON allows none";
        }
        if (m.contains("Invalid UTF-8")) {
            return "it is not UTF-8 text";
        }
        return "it holds something that is not JSON here";
    }

    private static Object value(JsonParser p, JsonToken t) throws IOException {
        switch (t) {
            case START_OBJECT: {
                Map<String, Object> map = new LinkedHashMap<>();
                for (JsonToken k = p.nextToken(); k != JsonToken.END_OBJECT; k = p.nextToken()) {
                    String name = p.currentName();
                    map.put(name, value(p, p.nextToken()));
                }
                return map;
            }
            case START_ARRAY:
                return array(p);
            case VALUE_STRING:
                return p.getText();
            case VALUE_NUMBER_INT:
                return p.getNumberType() == JsonParser.NumberType.BIG_INTEGER ? (Object) p.getDoubleValue()
                        : (Object) p.getLongValue();
            case VALUE_NUMBER_FLOAT:
                return p.getDoubleValue();
            case VALUE_TRUE:
                return Boolean.TRUE;
            case VALUE_FALSE:
                return Boolean.FALSE;
            case VALUE_NULL:
                return NULL;
            default:
                throw new IllegalStateException("unexpected JSON token " + t);
        }
    }

    /** Numbers (and nulls) go to a double buffer; the first other element turns the array into a list. */
    private static Object array(JsonParser p) throws IOException {
        double[] buffer = new double[16];
        int n = 0;
        int firstNull = -1;
        JsonToken t;
        while ((t = p.nextToken()) != JsonToken.END_ARRAY) {
            double v;
            if (t == JsonToken.VALUE_NUMBER_INT || t == JsonToken.VALUE_NUMBER_FLOAT) {
                v = p.getDoubleValue();
            } else if (t == JsonToken.VALUE_NULL) {
                v = Double.NaN;
                if (firstNull < 0) {
                    firstNull = n;
                }
            } else {
                List<Object> list = new ArrayList<>(n + 4);
                for (int i = 0; i < n; i++) {
                    // JSON has no NaN literal: a NaN in the buffer was a null
                    list.add(Double.isNaN(buffer[i]) ? NULL : (Object) buffer[i]);
                }
                list.add(value(p, t));
                while ((t = p.nextToken()) != JsonToken.END_ARRAY) {
                    list.add(value(p, t));
                }
                return list;
            }
            if (n == buffer.length) {
                buffer = Arrays.copyOf(buffer, buffer.length * 2);
            }
            buffer[n++] = v;
        }
        return new NumberArray(Arrays.copyOf(buffer, n), firstNull);
    }

    @SuppressWarnings("unchecked")
    private static Map<String, Object> cast(Object node) {
        return (Map<String, Object>) node;
    }

    /** @return a JSON value as a message shows it */
    static String show(Object v) {
        if (v == null) {
            return "nothing";
        }
        if (v instanceof String s) {
            return "the text " + BadInputException.shown(s);
        }
        if (v instanceof Map) {
            return "an object";
        }
        if (v instanceof List || v instanceof NumberArray) {
            return "an array";
        }
        if (v instanceof Double d) {
            return NumberText.shortest(d);
        }
        return String.valueOf(v);
    }

    /** A range of numbers a field accepts, with its words for messages. */
    enum Range {
        /** Any finite number. */
        ANY("a number"),
        /** A finite number ≥ 0. */
        NON_NEGATIVE("a number ≥ 0"),
        /** A finite number &gt; 0. */
        POSITIVE("a number > 0"),
        /** A number in [0, 1]. */
        UNIT("a number in [0, 1]"),
        /** A number in [0, 1). */
        MOMENTUM("a number in [0, 1)"),
        /** A number in (0, 1]: a fraction that is not empty. */
        TAIL("a number in (0, 1]");

        final String words;

        Range(String words) {
            this.words = words;
        }

        boolean holds(double v) {
            return switch (this) {
                case ANY -> Double.isFinite(v);
                case NON_NEGATIVE -> v >= 0 && Double.isFinite(v);
                case POSITIVE -> v > 0 && Double.isFinite(v);
                case UNIT -> v >= 0 && v <= 1;
                case MOMENTUM -> v >= 0 && v < 1;
                case TAIL -> v > 0 && v <= 1;
            };
        }
    }

    /**
     * A JSON object of a file, with typed, checked access to its fields. Getters throw a {@link BadInputException}
     * naming the file and key path for a key that is missing, of another type or out of its range.
     */
    static final class Obj {
        final String file;
        final String path;
        final Map<String, Object> map;

        Obj(String file, String path, Map<String, Object> map) {
            this.file = file;
            this.path = path;
            this.map = map;
        }

        /** @return the key path of {@code key} in this object */
        String at(String key) {
            return path.isEmpty() ? key : path + "." + key;
        }

        /** @return a refusal of {@code key}: "must be {@code expected}, not {@code found}" */
        BadInputException bad(String key, String expected, Object found) {
            return BadInputException.inFile(file, at(key), "must be " + expected + ", not " + show(found));
        }

        /** @return a refusal of {@code key} with a detail of its own */
        BadInputException problem(String key, String detail) {
            return BadInputException.inFile(file, key.isEmpty() ? path : at(key), detail);
        }

        boolean has(String key) {
            return map.containsKey(key);
        }

        /** @return true when {@code key} holds JSON null (a missing key is refused) */
        boolean isNull(String key) {
            return raw(key) == NULL;
        }

        /** @return the value at {@code key}, which must be present */
        Object raw(String key) {
            Object v = map.get(key);
            if (v == null) {
                throw BadInputException.inFile(file, at(key), "missing; every " + (path.isEmpty() ? "file of this kind"
                        : "'" + path + "'") + " has it");
            }
            return v;
        }

        /** @return the whole number at {@code key}, in [min, max] */
        long whole(String key, long min, long max) {
            Object v = raw(key);
            if (!(v instanceof Long l) || l < min || l > max) {
                throw bad(key, wholeWords(min, max), v);
            }
            return l;
        }

        /** @return the whole number at {@code key} in [min, max] as an int */
        int integer(String key, int min, int max) {
            return (int) whole(key, min, max);
        }

        private static String wholeWords(long min, long max) {
            if (max == Long.MAX_VALUE) {
                return min == Long.MIN_VALUE ? "a whole number" : "a whole number ≥ " + min;
            }
            return min == max ? "" + min : "a whole number in [" + min + ", " + max + "]";
        }

        /** @return the number at {@code key}, in {@code range} (null refused) */
        double number(String key, Range range) {
            Object v = raw(key);
            if (!(v instanceof Long || v instanceof Double) || !range.holds(((Number) v).doubleValue())) {
                throw bad(key, range.words, v);
            }
            return ((Number) v).doubleValue();
        }

        /** @return the number at {@code key} in {@code range}, or NaN for null ("does not apply") */
        double numberOrNull(String key, Range range) {
            Object v = raw(key);
            if (v == NULL) {
                return Double.NaN;
            }
            if (!(v instanceof Long || v instanceof Double) || !range.holds(((Number) v).doubleValue())) {
                throw bad(key, range.words + " or null", v);
            }
            return ((Number) v).doubleValue();
        }

        /** @return the string at {@code key} */
        String text(String key) {
            Object v = raw(key);
            if (!(v instanceof String s)) {
                throw bad(key, "a string", v);
            }
            return s;
        }

        /** @return the string at {@code key}, or null for JSON null */
        String textOrNull(String key) {
            return isNull(key) ? null : text(key);
        }

        /** @return the string at {@code key}, one of {@code choices} */
        String choice(String key, String... choices) {
            Object v = raw(key);
            if (v instanceof String s) {
                for (String c : choices) {
                    if (c.equals(s)) {
                        return s;
                    }
                }
            }
            throw bad(key, "one of " + String.join(", ", choices), v);
        }

        /** @return the boolean at {@code key} */
        boolean bool(String key) {
            Object v = raw(key);
            if (!(v instanceof Boolean b)) {
                throw bad(key, "true or false", v);
            }
            return b;
        }

        /** @return the object at {@code key} */
        Obj object(String key) {
            Object v = raw(key);
            if (!(v instanceof Map)) {
                throw bad(key, "an object", v);
            }
            return new Obj(file, at(key), cast(v));
        }

        /** @return the object at {@code key}, or null for JSON null */
        Obj objectOrNull(String key) {
            return isNull(key) ? null : object(key);
        }

        /** @return the objects of the array at {@code key} */
        List<Obj> objects(String key) {
            Object v = raw(key);
            List<Obj> out = new ArrayList<>();
            if (v instanceof NumberArray n && n.values().length == 0) {
                return out;
            }
            if (!(v instanceof List<?> list)) {
                throw bad(key, "an array of objects", v);
            }
            for (int i = 0; i < list.size(); i++) {
                if (!(list.get(i) instanceof Map)) {
                    throw BadInputException.inFile(file, at(key) + "[" + i + "]", "must be an object, not "
                            + show(list.get(i)));
                }
                out.add(new Obj(file, at(key) + "[" + i + "]", cast(list.get(i))));
            }
            return out;
        }

        /** @return the strings of the array at {@code key} */
        List<String> texts(String key) {
            Object v = raw(key);
            List<String> out = new ArrayList<>();
            if (v instanceof NumberArray n && n.values().length == 0) {
                return out;
            }
            if (!(v instanceof List<?> list)) {
                throw bad(key, "an array of strings", v);
            }
            for (int i = 0; i < list.size(); i++) {
                if (!(list.get(i) instanceof String s)) {
                    throw BadInputException.inFile(file, at(key) + "[" + i + "]", "must be a string, not "
                            + show(list.get(i)));
                }
                out.add(s);
            }
            return out;
        }

        /**
         * @param length the length required, or −1 for any
         * @param nullable whether an element may be null (read as NaN)
         * @return the numbers of the array at {@code key}, each in {@code range} or null where allowed
         */
        double[] numbers(String key, int length, Range range, boolean nullable) {
            Object v = raw(key);
            double[] values;
            if (v instanceof NumberArray n) {
                values = n.values();
            } else {
                throw bad(key, "an array of numbers", v);
            }
            if (length >= 0 && values.length != length) {
                throw BadInputException.inFile(file, at(key), "holds " + values.length + " values; expected "
                        + length);
            }
            for (int i = 0; i < values.length; i++) {
                double x = values[i];
                if (Double.isNaN(x) ? !nullable : !range.holds(x)) {
                    throw BadInputException.inFile(file, at(key) + "[" + i + "]", "must be " + range.words
                            + (nullable ? " or null" : "") + ", not " + (Double.isNaN(x) ? "null" : show(x)));
                }
            }
            return values;
        }

        /** @return the numbers at {@code key} (as {@link #numbers}), or null for JSON null */
        double[] numbersOrNull(String key, int length, Range range, boolean nullable) {
            return isNull(key) ? null : numbers(key, length, range, nullable);
        }

        /** @return the whole numbers of the array at {@code key}, each in [min, max] */
        long[] wholes(String key, int length, long min, long max) {
            double[] values = numbers(key, length, Range.ANY, false);
            long[] out = new long[values.length];
            for (int i = 0; i < values.length; i++) {
                double x = values[i];
                if (x != Math.rint(x) || x < min || x > max || Math.abs(x) > 0x1p53) {
                    // a whole number out of range is shown as the file writes it (5, not 5.0)
                    Object found = x == Math.rint(x) && Math.abs(x) <= 0x1p53 ? (Object) (long) x : (Object) x;
                    throw BadInputException.inFile(file, at(key) + "[" + i + "]", "must be " + wholeWords(min, max)
                            + ", not " + show(found));
                }
                out[i] = (long) x;
            }
            return out;
        }
    }
}
