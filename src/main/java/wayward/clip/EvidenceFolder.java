package wayward.clip;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.LinkOption;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

/**
 * The evidence folder of a data folder ({@code DATA_DIR/evidence}: clips, snapshots and their JSON), and its
 * one-time move from the name older versions used ({@code DATA_DIR/clips}), so that retention still finds and
 * deletes the files kept before an upgrade. Called once at start, before any camera runs.
 */
public final class EvidenceFolder {
    private static final Logger LOG = LoggerFactory.getLogger(EvidenceFolder.class);

    /** The folder's name under the data folder; event records name their files relative to the data folder. */
    public static final String NAME = "evidence";
    /** The name versions before the rename used. */
    static final String OLD_NAME = "clips";

    private EvidenceFolder() {
    }

    /** The evidence folder of a data folder (it may not exist yet). */
    public static Path of(Path dataDir) {
        return dataDir.resolve(NAME);
    }

    /**
     * Moves {@code clips/} to {@code evidence/} in one atomic rename when only the old one exists, with one log
     * line saying so; when both exist, leaves both and logs that {@code evidence/} is used (and retention leaves
     * {@code clips/} alone). Returns the evidence folder.
     *
     * @throws IOException the rename failed (the message names both folders)
     */
    public static Path upgrade(Path dataDir) throws IOException {
        Path evidence = of(dataDir);
        Path old = dataDir.resolve(OLD_NAME);
        if (!Files.isDirectory(old, LinkOption.NOFOLLOW_LINKS)) {
            return evidence;
        }
        if (Files.exists(evidence, LinkOption.NOFOLLOW_LINKS)) {
            LOG.warn("evidence: both {} (from an older version) and {} exist; {} is used, {} is left as it is and "
                    + "retention does not sweep it", old, evidence, evidence, old);
            return evidence;
        }
        try {
            Files.move(old, evidence, StandardCopyOption.ATOMIC_MOVE);
        } catch (IOException e) {
            throw new IOException("cannot rename " + old + " to " + evidence + ": " + e, e);
        }
        LOG.info("evidence: renamed {} to {} (the folder's new name); its files are kept and swept as before", old,
                evidence);
        return evidence;
    }
}
