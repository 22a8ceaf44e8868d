package wayward.capture;

import java.nio.charset.StandardCharsets;
import org.bytedeco.ffmpeg.avutil.LogCallback;
import org.bytedeco.ffmpeg.global.avutil;
import org.bytedeco.javacpp.BytePointer;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;
import wayward.secret.LogText;

/**
 * FFmpeg's own log lines into SLF4J (logger {@code ffmpeg}) through {@link LogText#clean}: FFmpeg quotes the
 * addresses it opens, passwords included, and a stream's metadata may hold control characters. Installed once.
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
        String text = LogText.clean(msg.getString(StandardCharsets.UTF_8).strip());
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
}
