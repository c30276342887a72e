/**
 * What a line of a mount table is: a mounted file system as util-linux `mount` prints it
 * (`sysfs on /sys type sysfs (rw,nosuid)`, seen here; BSD's `/dev/ada0p2 on / (ufs, local)` from
 * memory), as `/proc/mounts` and `/etc/fstab` write it (six fields split by blanks, the last two
 * numbers: fstab(5), `sysfs /sys sysfs rw,nosuid 0 0`, seen here), or as `/proc/self/mountinfo` does
 * (two ids, major:minor, root, mount point, options, optional fields, `-`, type, source, options:
 * proc(5), seen here); a comment (`#`, as fstab has); or none of them.
 */
export function mountLine(text: string): "mount" | "comment" | undefined {
  if (text.startsWith("#")) return "comment";
  return MOUNT.test(text) || FSTAB.test(text) || MOUNTINFO.test(text) ? "mount" : undefined;
}

const MOUNT = /^\S+ on \/.* \([^()]*\)$/;
const FSTAB = /^\S+[ \t]+\S+[ \t]+\S+[ \t]+\S+[ \t]+[0-9]+[ \t]+[0-9]+[ \t]*$/;
const MOUNTINFO = /^[0-9]+ [0-9]+ [0-9]+:[0-9]+ \S+ \S+ \S+(?: \S+)* - \S+ \S+ \S+$/;

/** The PARSE_PATHS message for a mount table read as a path list: what it is, and what reads mounts. */
export const MOUNT_TABLE =
  "every line is a mounted file system, as mount, /proc/mounts, /etc/fstab and /proc/self/mountinfo list them (a device, the folder it is mounted on, a type, options): read as a path list, each whole line would be one path split at the folder's '/'s, the device and options part of the names. findmnt -J lists the mounts as nested JSON, each under the one it is mounted on: findmnt -J | espalier - --start-at /filesystems --name-field target; to read each line as a path, pass --input-format paths";
