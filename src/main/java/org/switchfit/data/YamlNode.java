package org.switchfit.data;

import com.fasterxml.jackson.core.JsonLocation;
import com.fasterxml.jackson.core.JsonParser;
import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.core.JsonToken;
import com.fasterxml.jackson.dataformat.yaml.YAMLFactory;
import java.io.IOException;
import java.io.Reader;
import java.io.StringReader;
import java.util.ArrayList;
import java.util.Collection;
import java.util.Collections;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import org.switchfit.util.SourceLocation;
import org.switchfit.util.UserInputException;

/**
 * A YAML document node that remembers the file and line it came from (taken from Jackson's
 * {@link JsonLocation}), with typed accessors that throw {@link UserInputException}s naming file, line and key.
 * Package-private; immutable once built.
 */
final class YamlNode {

    enum Kind { MAP, LIST, SCALAR, NULL }

    private static final YAMLFactory FACTORY = new YAMLFactory();

    private final String source;
    private final Kind kind;
    private final int line;
    private final int column;
    private final String path;
    private final Map<String, YamlNode> map;
    private final Map<String, Integer> keyLines;
    private final List<YamlNode> list;
    private final String text;

    private YamlNode(String source, Kind kind, JsonLocation loc, String path, Map<String, YamlNode> map,
            List<YamlNode> list, String text) {
        this(source, kind, loc, path, map, null, list, text);
    }

    private YamlNode(String source, Kind kind, JsonLocation loc, String path, Map<String, YamlNode> map,
            Map<String, Integer> keyLines, List<YamlNode> list, String text) {
        this.source = source;
        this.keyLines = keyLines;
        this.kind = kind;
        this.line = loc == null ? 0 : loc.getLineNr();
        this.column = loc == null ? 0 : loc.getColumnNr();
        this.path = path;
        this.map = map;
        this.list = list;
        this.text = text;
    }

    /** Parses a whole YAML document; an empty document gives a NULL node. */
    static YamlNode parse(String content, String source) {
        try (Reader r = new StringReader(content); JsonParser p = FACTORY.createParser(r)) {
            JsonToken t = p.nextToken();
            if (t == null) {
                return new YamlNode(source, Kind.NULL, null, "", null, null, null);
            }
            YamlNode root = read(p, source, "");
            if (p.nextToken() != null) {
                // a '---' starts another document, which would otherwise be ignored silently
                throw Messages.error(SourceLocation.ofLine(source, p.currentTokenLocation().getLineNr()),
                        "a second YAML document starts here (after '---'); the file must hold one document: remove"
                        + " the '---' line and merge what follows into the first document, or delete it");
            }
            return root;
        } catch (JsonProcessingException e) {
            JsonLocation loc = e.getLocation();
            int line = loc == null ? 0 : loc.getLineNr();
            String detail = e.getOriginalMessage().split("\\R", 2)[0];
            throw Messages.error(SourceLocation.ofLine(source, line), e,
                    "not valid YAML (%s); check indentation and quoting near this line", detail);
        } catch (IOException e) {
            throw new UserInputException(SourceLocation.ofFile(source), "cannot read YAML: " + e.getMessage(), e);
        }
    }

    private static YamlNode read(JsonParser p, String source, String path) throws IOException {
        JsonToken t = p.currentToken();
        JsonLocation loc = p.currentTokenLocation();
        if (t == JsonToken.START_OBJECT) {
            Map<String, YamlNode> m = new LinkedHashMap<>();
            Map<String, Integer> lines = new LinkedHashMap<>();
            while (p.nextToken() == JsonToken.FIELD_NAME) {
                String key = p.currentName();
                JsonLocation keyLoc = p.currentTokenLocation();
                p.nextToken();
                YamlNode child = read(p, source, path.isEmpty() ? key : path + "." + key);
                if (m.containsKey(key)) {
                    throw Messages.error(SourceLocation.ofLine(source, keyLoc.getLineNr()),
                            "key '%s' appears twice%s; keep only one", key, path.isEmpty() ? "" : " in '" + path + "'");
                }
                m.put(key, child);
                lines.put(key, keyLoc.getLineNr());
            }
            return new YamlNode(source, Kind.MAP, loc, path, Collections.unmodifiableMap(m), lines, null, null);
        }
        if (t == JsonToken.START_ARRAY) {
            List<YamlNode> l = new ArrayList<>();
            int i = 0;
            while (p.nextToken() != JsonToken.END_ARRAY) {
                l.add(read(p, source, path + "[" + i + "]"));
                i++;
            }
            return new YamlNode(source, Kind.LIST, loc, path, null, Collections.unmodifiableList(l), null);
        }
        if (t == JsonToken.VALUE_NULL) {
            return new YamlNode(source, Kind.NULL, loc, path, null, null, null);
        }
        return new YamlNode(source, Kind.SCALAR, loc, path, null, null, p.getText());
    }

    Kind kind() {
        return kind;
    }

    String source() {
        return source;
    }

    int line() {
        return line;
    }

    /** Location of this node. */
    SourceLocation location() {
        return new SourceLocation(source, line, column, null);
    }

    /** Dotted path from the document root, e.g. {@code experiments[2].doses}. */
    String path() {
        return path;
    }

    private String name() {
        return path.isEmpty() ? "the document" : "'" + path + "'";
    }

    /** Fails unless this is a map; {@code example} shows the expected shape. */
    YamlNode requireMap(String example) {
        if (kind != Kind.MAP) {
            throw Messages.error(location(), "%s must be a map of keys to values, such as %s", name(), example);
        }
        return this;
    }

    /** Fails unless this is a list. */
    List<YamlNode> requireList(String example) {
        if (kind != Kind.LIST) {
            throw Messages.error(location(), "%s must be a list (lines starting with '- '), such as %s",
                    name(), example);
        }
        return list;
    }

    /** Entries of a map node (empty for NULL). */
    Map<String, YamlNode> entries() {
        return map == null ? Map.of() : map;
    }

    /** Child of a map, or null. */
    YamlNode get(String key) {
        return map == null ? null : map.get(key);
    }

    boolean has(String key) {
        YamlNode n = get(key);
        return n != null && n.kind != Kind.NULL;
    }

    /** Fails on any key not in {@code allowed}, suggesting the closest allowed key. */
    void checkKeys(Collection<String> allowed) {
        for (Map.Entry<String, YamlNode> e : entries().entrySet()) {
            if (!allowed.contains(e.getKey())) {
                throw Messages.error(SourceLocation.ofLine(source, keyLines.get(e.getKey())),
                        "unknown key '%s' in %s%s; allowed keys: %s", e.getKey(), name(),
                        Spelling.didYouMean(e.getKey(), allowed), String.join(", ", allowed));
            }
        }
    }

    /** Required child of a map. */
    YamlNode require(String key, String example) {
        YamlNode n = get(key);
        if (n == null || n.kind == Kind.NULL) {
            throw Messages.error(location(), "%s has no '%s'; add it, e.g. %s: %s", name(), key, key,
                    example);
        }
        return n;
    }

    /** The scalar text of this node. */
    String scalar(String example) {
        if (kind != Kind.SCALAR) {
            throw Messages.error(location(), "%s must be a single value such as %s, not a %s", name(),
                    example, kind.name().toLowerCase(Locale.ROOT));
        }
        return text;
    }

    /** A required string child. */
    String string(String key, String example) {
        return require(key, example).scalar(example);
    }

    /** An optional string child, or null. */
    String optString(String key, String example) {
        return has(key) ? get(key).scalar(example) : null;
    }

    /** The numeric value of this scalar node. */
    double number(String example) {
        String t = scalar(example);
        try {
            return DataNumbers.parse(t);
        } catch (NumberFormatException e) {
            throw Messages.error(location(), e, "%s: '%s' is not a number; write a number such as %s", name(), t,
                    example);
        }
    }

    /** A required numeric child. */
    double number(String key, String example) {
        return require(key, example).number(example);
    }

    /** A required id child (SBML SId syntax). */
    String id(String key, String example) {
        YamlNode n = require(key, example);
        String t = n.scalar(example);
        if (!ValueRef.isId(t)) {
            throw Messages.error(n.location(), "%s: '%s' is not a valid id; use letters, digits and"
                    + " underscores, starting with a letter or underscore, e.g. %s", n.name(), t, example);
        }
        return t;
    }

    /** This scalar as a number or parameter id. */
    ValueRef valueRef(String example) {
        String t = scalar(example);
        ValueRef v = ValueRef.parse(t);
        if (v == null) {
            throw Messages.error(location(), "%s: '%s' is neither a number nor a parameter id; write e.g. %s",
                    name(), t, example);
        }
        return v;
    }
}
