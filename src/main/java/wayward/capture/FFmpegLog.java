package wayward.capture;

import java.nio.charset.StandardCharsets;
import org.bytedeco.ffmpeg.avutil.LogCallback;
import org.bytedeco.ffmpeg.global.avutil;
import org.bytedeco.javacpp.BytePointer;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;
import wayward.secret.Urls;

/**
 * FFmpeg's own log lines into SLF4J (logger {@code ffmpeg}), each URL in them masked ({@link Urls#maskIn}: FFmpeg
 * quotes the addresses it opens, passwords included) and control characters written as \xNN. Installed once.
 */
final class FFmpegLog extends LogCallback {
    private static final Logger LOG = LoggerFactory.getLogger("ffmpeg");
    /** Kept: FFmpeg holds only a native pointer to it. */
    private static final FFmpegLog INSTANCE = new FFmpegLog();

    private FFmpegLog() {
    }

    static void install() {
        avutil.setLogCallback(INSTANCE);
    }

    @Override
    public void call(int level, BytePointer msg) {
        if (level > avutil.av_log_get_level()) {
            return; // FFmpeg hands a callback every line; the level it is set to filters only its own printing
        }
        String text = clean(Urls.maskIn(msg.getString(StandardCharsets.UTF_8).strip()));
        if (text.isEmpty()) {
            return;
        }
        if (level <= avutil.AV_LOG_ERROR) {
            LOG.error(text);
        } else if (level <= avutil.AV_LOG_WARNING) {
            LOG.warn(text);
        } else if (level <= avutil.AV_LOG_INFO) {
            LOG.info(text);
        } else {
            LOG.debug(text);
        }
    }

    /** Control characters (a stream's metadata may hold any) as \xNN, so that a log line stays one line. */
    static String clean(String s) {
        StringBuilder b = null;
        for (int i = 0; i < s.length(); i++) {
            char c = s.charAt(i);
            if (c < 0x20 || c == 0x7f) {
                if (b == null) {
                    b = new StringBuilder(s.length() + 8).append(s, 0, i);
                }
                b.append(String.format(java.util.Locale.ROOT, "\\x%02x", (int) c));
            } else if (b != null) {
                b.append(c);
            }
        }
        return b == null ? s : b.toString();
    }
}
