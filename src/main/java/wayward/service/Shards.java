package wayward.service;

import java.nio.ByteBuffer;
import java.nio.charset.StandardCharsets;
import java.security.MessageDigest;
import java.security.NoSuchAlgorithmException;
import java.util.ArrayList;
import java.util.List;
import wayward.analysis.CameraConfig;
import wayward.config.SiteConfig;

/**
 * Which instance watches which camera: rendezvous (highest random weight) hashing of the camera id over the
 * instance names (Thaler and Ravishankar, 1998). Every instance computes the same answer from the same list,
 * with no coordination, and adding or removing an instance moves only the cameras it gains or held. The weight
 * is the first 8 bytes of SHA-256(instance, NUL, camera), so it does not depend on the JVM.
 */
public final class Shards {
    private Shards() {
    }

    static long weight(String instance, String camera) {
        try {
            MessageDigest d = MessageDigest.getInstance("SHA-256");
            d.update(instance.getBytes(StandardCharsets.UTF_8));
            d.update((byte) 0);
            d.update(camera.getBytes(StandardCharsets.UTF_8));
            return ByteBuffer.wrap(d.digest()).getLong();
        } catch (NoSuchAlgorithmException e) {
            throw new IllegalStateException(e);
        }
    }

    /** The instance that watches {@code camera}. */
    public static String owner(String camera, List<String> instances) {
        String best = null;
        long bestWeight = 0;
        for (String i : instances) {
            long w = weight(i, camera);
            if (best == null || Long.compareUnsigned(w, bestWeight) > 0) {
                best = i;
                bestWeight = w;
            }
        }
        return best;
    }

    /** The cameras of {@code all} that {@code instance} watches, in config order. */
    public static List<String> mine(List<String> cameras, String instance, List<String> instances) {
        List<String> out = new ArrayList<>();
        for (String c : cameras) {
            if (instance.equals(owner(c, instances))) {
                out.add(c);
            }
        }
        return out;
    }

    /** The cameras this instance watches: all of them, or its share when instances share the config. */
    static List<CameraConfig> camerasOf(SiteConfig config, List<CameraConfig> cameras) {
        if (config.shard() == null) {
            return List.copyOf(cameras);
        }
        List<String> ids = new ArrayList<>();
        cameras.forEach(c -> ids.add(c.id()));
        List<String> mine = Shards.mine(ids, config.shard().instance(), config.shard().instances());
        List<CameraConfig> out = new ArrayList<>();
        for (CameraConfig c : cameras) {
            if (mine.contains(c.id())) {
                out.add(c);
            }
        }
        return out;
    }
}
