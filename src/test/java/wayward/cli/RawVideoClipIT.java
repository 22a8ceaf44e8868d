package wayward.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Path;
import java.util.List;
import java.util.Map;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.Timeout;
import org.junit.jupiter.api.io.TempDir;

/**
 * A source of raw video, as an uncompressed webcam gives (YUYV 4:2:2, made from the demo clip with Debian's
 * ffmpeg into NUT): MP4 cannot hold raw video, so the clip is encoded with libopenh264. ffprobe: H.264,
 * keyframe at pts 0, the span from trigger − pre-roll to end + post-roll (every raw frame is a keyframe, so no
 * GOP slack), the source's frame rate, clean decode.
 */
class RawVideoClipIT {
    @Test
    @Timeout(value = 180, unit = TimeUnit.SECONDS)
    void rawVideoClipsAreEncoded(@TempDir Path dir) throws Exception {
        Path raw = dir.resolve("raw.nut");
        YardSite.command("ffmpeg", "-v", "error", "-i", YardSite.clip().toString(), "-vf", "scale=320:180",
                "-c:v", "rawvideo", "-pix_fmt", "yuyv422", "-f", "nut", raw.toString());
        Path config = YardSite.config(dir, raw.toString());
        ProcessRunner.Result r = ProcessRunner.run(List.of("java", "-jar", ProcessRunner.jar().toString(), "run",
                "--config", config.toString()), dir, 150);
        assertEquals(0, r.exitCode(), r.stderr());
        Path log = dir.resolve("data/events.jsonl");
        Map<String, Object> start = YardSite.awaitRecord(log, "wrong_way", "start", 1, 1);
        Map<String, Object> end = YardSite.awaitRecord(log, "wrong_way", "end", 1, 1);
        Path clip = dir.resolve("data").resolve((String) end.get("clip"));
        assertEquals("h264", YardSite.command("ffprobe", "-v", "error", "-select_streams", "v:0", "-show_entries",
                "stream=codec_name", "-of", "csv=p=0", clip.toString()));
        String first = YardSite.command("ffprobe", "-v", "error", "-select_streams", "v:0", "-read_intervals", "%+#1",
                "-show_entries", "packet=pts_time,flags", "-of", "csv=p=0", clip.toString());
        assertTrue(first.startsWith("0.000000,K"), first);
        double duration = Double.parseDouble(YardSite.command("ffprobe", "-v", "error", "-show_entries",
                "format=duration", "-of", "csv=p=0", clip.toString()));
        double span = (Double) end.get("stream_s") + 4 - ((Double) start.get("stream_s") - 3);
        assertEquals(span, duration, 0.3, "clip from trigger − 3 s to end + 4 s");
        int packets = Integer.parseInt(YardSite.command("ffprobe", "-v", "error", "-select_streams", "v:0",
                "-count_packets", "-show_entries", "stream=nb_read_packets", "-of", "csv=p=0", clip.toString()));
        assertEquals(duration * 15, packets, 1.5, "15 frames per second, as the source");
        assertEquals("", YardSite.command("ffmpeg", "-v", "error", "-i", clip.toString(), "-f", "null", "-"));
    }
}
