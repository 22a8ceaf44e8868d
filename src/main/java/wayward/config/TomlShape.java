package wayward.config;

import java.nio.ByteBuffer;
import java.nio.CharBuffer;
import java.nio.charset.CharacterCodingException;
import java.nio.charset.CharsetDecoder;
import java.nio.charset.CodingErrorAction;
import java.nio.charset.StandardCharsets;
import java.util.List;

/**
 * Checks on a config file's text before the TOML parser sees it, each failing with one located line: the bytes
 * must be UTF-8 (TOML 1.0), and arrays and inline tables may nest at most {@link #MAX_NESTING} deep (the parser
 * recurses once per level: a thousand levels overflow its stack; no config needs more than three).
 */
final class TomlShape {
    static final int MAX_NESTING = 32;

    private TomlShape() {
    }

    /** The file's text; a ConfigException naming line and column of the first byte that is not UTF-8. */
    static String text(byte[] bytes, String shown) throws ConfigException {
        CharsetDecoder d = StandardCharsets.UTF_8.newDecoder().onMalformedInput(CodingErrorAction.REPORT)
                .onUnmappableCharacter(CodingErrorAction.REPORT);
        try {
            return d.decode(ByteBuffer.wrap(bytes)).toString();
        } catch (CharacterCodingException e) {
            // decode up to the first bad byte to say where it is
            ByteBuffer in = ByteBuffer.wrap(bytes);
            CharBuffer out = CharBuffer.allocate(bytes.length);
            StandardCharsets.UTF_8.newDecoder().onMalformedInput(CodingErrorAction.REPORT)
                    .onUnmappableCharacter(CodingErrorAction.REPORT).decode(in, out, true);
            out.flip();
            int[] lc = lineColumn(out, out.length());
            throw new ConfigException(List.of(shown + ":" + lc[0] + ":" + lc[1] + ": not UTF-8 text at byte "
                    + in.position() + " (expected a TOML file, which is UTF-8 text)"));
        }
    }

    /** Refuses arrays and inline tables nested deeper than {@link #MAX_NESTING}, naming the first too deep. */
    static void checkNesting(String s, String shown) throws ConfigException {
        int depth = 0;
        for (int i = 0; i < s.length(); i++) {
            char c = s.charAt(i);
            if (c == '#') {
                while (i < s.length() && s.charAt(i) != '\n') {
                    i++;
                }
            } else if (c == '"' || c == '\'') {
                boolean multi = s.startsWith(String.valueOf(c).repeat(3), i);
                String end = multi ? String.valueOf(c).repeat(3) : String.valueOf(c);
                i += multi ? 3 : 1;
                while (i < s.length() && !s.startsWith(end, i) && (multi || s.charAt(i) != '\n')) {
                    i += c == '"' && s.charAt(i) == '\\' ? 2 : 1;
                }
                i += end.length() - 1;
            } else if (c == '[' || c == '{') {
                if (++depth > MAX_NESTING) {
                    int[] lc = lineColumn(s, i);
                    throw new ConfigException(List.of(shown + ":" + lc[0] + ":" + lc[1] + ": arrays or tables nested "
                            + "more than " + MAX_NESTING + " deep (expected a config; none needs more than three)"));
                }
            } else if (c == ']' || c == '}') {
                depth = Math.max(0, depth - 1);
            }
        }
    }

    private static int[] lineColumn(CharSequence s, int upTo) {
        int line = 1;
        int column = 1;
        for (int i = 0; i < upTo; i++) {
            if (s.charAt(i) == '\n') {
                line++;
                column = 1;
            } else {
                column++;
            }
        }
        return new int[] {line, column};
    }
}
