package wayward.scene;

import static org.bytedeco.ffmpeg.global.avutil.AV_PIX_FMT_GRAY8;
import static org.bytedeco.ffmpeg.global.avutil.AV_PIX_FMT_YUV420P;

import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.file.Files;
import java.nio.file.Path;
import org.bytedeco.javacv.FFmpegFrameRecorder;
import org.bytedeco.javacv.Frame;

/**
 * Renders a scenario video with exact ground truth: a textured background (generated, or a real photograph),
 * movers (generated texture, plain with a rim, or a patch of a photograph) on straight scripted paths at set
 * times and sizes, nuisances (light changes and flicker, headlight glare, shake, rain, foliage, shadow,
 * tampering) and Gaussian sensor noise; writes an H.264 MP4 (the FFmpeg build's libopenh264 encoder)
 * and a JSON file saying, per mover, its path, its bearing and when its centre is inside each zone and whether
 * it moves against that zone's heading. Deterministic for a given scene (seeded). Used for tests and the demo.
 */
public final class SceneGenerator {
    /** Slower than this (pixels per second) a mover counts as standing, not as going the wrong way. */
    public static final double AGAINST_MIN_SPEED = 5;

    private final Scene scene;

    public SceneGenerator(Scene scene) {
        this.scene = scene;
    }

    /** Writes {@code video} (MP4) and {@code truth} (JSON). */
    public void write(Path video, Path truth) throws IOException {
        int w = scene.width();
        int h = scene.height();
        FrameCompositor compositor = new FrameCompositor(scene);
        int frames = (int) Math.round(scene.seconds() * scene.fps());
        if (video.getParent() != null) {
            Files.createDirectories(video.getParent());
        }
        try (FFmpegFrameRecorder rec = new FFmpegFrameRecorder(video.toFile(), w, h, 0)) {
            rec.setFormat("mp4");
            rec.setVideoCodecName("libopenh264");
            rec.setFrameRate(scene.fps());
            rec.setGopSize((int) Math.round(scene.fps() * 2));
            rec.setVideoBitrate(scene.bitrateKbps() * 1000);
            rec.setPixelFormat(AV_PIX_FMT_YUV420P);
            rec.setVideoOption("threads", "1");
            rec.start();
            for (int f = 0; f < frames; f++) {
                ByteBuffer buffer = ByteBuffer.wrap(compositor.render(f / scene.fps()));
                rec.recordImage(w, h, Frame.DEPTH_UBYTE, 1, w, AV_PIX_FMT_GRAY8, buffer);
            }
            rec.stop();
        }
        TruthWriter.write(scene, truth, video.getFileName().toString());
    }
}
