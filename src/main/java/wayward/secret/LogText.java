package wayward.secret;

import java.util.Locale;
import java.util.regex.Pattern;

/**
 * Text from outside (a request's path, an exception's message, FFmpeg's lines) made fit for one log line: every
 * URL masked ({@link Urls#maskIn}), an {@code access_token} value hidden wherever it stands, control characters
 * written as \xNN so that nobody can forge or hide lines, and at most 200 characters.
 */
public final class LogText {
    private static final int MAX_CHARS = 200;
    private static final Pattern TOKEN = Pattern.compile("(?i)(access_token=)[^&\\s'\"]*");

    private LogText() {
    }

    public static String clean(String s) {
        if (s == null) {
            return "null";
        }
        String t = TOKEN.matcher(Urls.maskIn(s)).replaceAll("$1***");
        StringBuilder b = new StringBuilder(Math.min(t.length(), MAX_CHARS) + 8);
        for (int i = 0; i < t.length(); i++) {
            if (b.length() >= MAX_CHARS) {
                return b.append('…').toString();
            }
            char c = t.charAt(i);
            if (c < 0x20 || c == 0x7f || (c >= 0x80 && c < 0xa0)) {
                b.append(String.format(Locale.ROOT, "\\x%02x", (int) c));
            } else {
                b.append(c);
            }
        }
        return b.toString();
    }
}
