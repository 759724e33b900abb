"""What the built distributions carry for the GMP library that binary wheels bundle: GMP's licence
texts and amalgebra's notice (LICENSES/, in every wheel's ``.dist-info/licenses/`` and in the sdist),
and the record of the GMP version a wheel's compiled kernel was built on.

The distributions checked are those in ``AMALGEBRA_TEST_DIST_DIR`` when it is set (``.ci/run``
stage 2 points it at the sdist and the auditwheel-repaired wheel, the wheel a release publishes
for Linux); otherwise a wheel is built here from a copy of the source tree with plain
``pip wheel`` (as a user's ``pip install`` builds it), and the sdist checks need
``AMALGEBRA_TEST_DIST_DIR``.
"""

import ctypes
import ctypes.util
import email.parser
import hashlib
import os
import re
import shutil
import subprocess
import sys
import tarfile
import zipfile
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parents[1]
# the files of LICENSES/ (GMP's licence texts: the FSF's, unchanged; amalgebra's notice)
LICENCE_FILES = ["LICENSES/GMP-NOTICE.txt", "LICENSES/LGPL-3.0.txt", "LICENSES/GPL-3.0.txt",
                 "LICENSES/GPL-2.0.txt"]
# each GNU text by its title and version lines (the FSF's texts, from their headers), and Debian's copy
# (package base-files) where the machine has one
GNU_TEXTS = {
    "LICENSES/LGPL-3.0.txt": ("GNU LESSER GENERAL PUBLIC LICENSE", "Version 3, 29 June 2007",
                              "/usr/share/common-licenses/LGPL-3"),
    "LICENSES/GPL-3.0.txt": ("GNU GENERAL PUBLIC LICENSE", "Version 3, 29 June 2007",
                             "/usr/share/common-licenses/GPL-3"),
    "LICENSES/GPL-2.0.txt": ("GNU GENERAL PUBLIC LICENSE", "Version 2, June 1991",
                             "/usr/share/common-licenses/GPL-2"),
}


def _in_ci():
    return os.environ.get("CI", "").lower() not in ("", "0", "false", "no")


def _unavailable(reason):
    """Skip locally; fail under CI=true, where every packaging check must run."""
    if _in_ci():
        pytest.fail(f"{reason} (CI=true: packaging checks must not skip)")
    pytest.skip(reason)


def _copy_source_tree(target):
    keep_out = shutil.ignore_patterns(".git", "build", "dist", "*.egg-info", "__pycache__", "*.so",
                                      ".hypothesis", ".pytest_cache", ".mypy_cache", "node_modules", "_build",
                                      "_generated", "report")
    shutil.copytree(ROOT, target, ignore=keep_out)


@pytest.fixture(scope="module")
def dists(tmp_path_factory):
    """``{"wheel": Path, "sdist": Path or None}``: the distributions under test."""
    given = os.environ.get("AMALGEBRA_TEST_DIST_DIR")
    if given:
        folder = Path(given)
        wheels = sorted(folder.glob("amalgebra-*.whl"))
        sdists = sorted(folder.glob("amalgebra-*.tar.gz"))
        assert len(wheels) == 1, f"AMALGEBRA_TEST_DIST_DIR={given} must hold one amalgebra wheel: {wheels}"
        return {"wheel": wheels[0], "sdist": sdists[0] if sdists else None}
    if not (ROOT / "pyproject.toml").is_file() or not (ROOT / "LICENSES").is_dir():
        _unavailable("no source tree to build a wheel from (set AMALGEBRA_TEST_DIST_DIR)")
    work = tmp_path_factory.mktemp("packaging")
    _copy_source_tree(work / "src")
    result = subprocess.run([sys.executable, "-m", "pip", "wheel", "--no-deps", "-q", "-w", str(work / "out"),
                             str(work / "src")], capture_output=True, text=True, timeout=600)
    if result.returncode != 0:
        _unavailable(f"pip wheel failed (build requirements unreachable?): {result.stderr[-800:]}")
    (wheel,) = sorted((work / "out").glob("amalgebra-*.whl"))
    return {"wheel": wheel, "sdist": None}


@pytest.fixture(scope="module")
def wheel(dists):
    return zipfile.ZipFile(dists["wheel"])


def _dist_info(wheel):
    (name,) = {n.split("/", 1)[0] for n in wheel.namelist() if n.split("/", 1)[0].endswith(".dist-info")}
    return name


def _has_kernel(wheel):
    return any(re.fullmatch(r"amalgebra/coupling/_racah6j[^/]*\.(so|pyd)", n) for n in wheel.namelist())


def test_wheel_carries_gmp_licence_texts_and_notice(wheel):
    licences = f"{_dist_info(wheel)}/licenses/"
    for name in ["LICENSE", *LICENCE_FILES]:
        data = wheel.read(licences + name)  # KeyError: missing
        if (ROOT / name).is_file():  # the wheel's copy is the repository's file, byte for byte
            assert data == (ROOT / name).read_bytes(), name


def test_wheel_metadata_names_the_licences(wheel):
    metadata = email.parser.BytesParser().parsebytes(wheel.read(f"{_dist_info(wheel)}/METADATA"))
    assert sorted(metadata.get_all("License-File")) == sorted(["LICENSE", *LICENCE_FILES])
    # SPDX: amalgebra's own licence, and GMP's choice of licences for the library the binary wheels carry
    assert metadata["License-Expression"] == "BSD-3-Clause AND (LGPL-3.0-or-later OR GPL-2.0-or-later)"


@pytest.mark.parametrize("name", sorted(GNU_TEXTS))
def test_gnu_texts_are_the_fsf_texts(wheel, name):
    data = wheel.read(f"{_dist_info(wheel)}/licenses/{name}")
    title, version, debian = GNU_TEXTS[name]
    head = [line.strip() for line in data.decode("utf-8").splitlines()[:3]]
    assert head[:2] == [title, version], head
    if not Path(debian).is_file():
        _unavailable(f"no copy of the FSF text at {debian} to compare {name} with")
    # Debian's base-files ships the FSF's texts verbatim (https://www.gnu.org/licenses/)
    assert hashlib.sha256(data).hexdigest() == hashlib.sha256(Path(debian).read_bytes()).hexdigest()


def test_notice_says_what_is_bundled_where_and_under_which_licence(wheel):
    notice = wheel.read(f"{_dist_info(wheel)}/licenses/LICENSES/GMP-NOTICE.txt").decode("utf-8")
    for needed in ["LGPL-3.0-or-later", "GPL-2.0-or-later", "dynamically", "amalgebra.libs/libgmp",
                   "amalgebra/.dylibs/libgmp", "amalgebra/coupling/GMP-VERSION.txt", "https://gmplib.org/",
                   "https://ftp.gnu.org/gnu/gmp/", "AMALGEBRA_GMP_PREFIX"]:
        assert needed in notice, needed
    for name in LICENCE_FILES[1:]:  # every licence text it refers to is shipped beside it
        assert Path(name).name in notice, name


def test_wheel_with_the_kernel_records_the_gmp_version_it_carries(wheel, tmp_path):
    if not _has_kernel(wheel):
        _unavailable("the wheel has no compiled kernel (built without GMP's headers)")
    record = wheel.read("amalgebra/coupling/GMP-VERSION.txt").decode("utf-8")
    recorded = re.match(r"GNU MP (\d+\.\d+\.\d+)\n", record)
    assert recorded, record
    bundled = [n for n in wheel.namelist() if n.startswith("amalgebra.libs/libgmp")]
    if bundled:  # a repaired (manylinux) wheel: the version the bundled library reports itself
        (member,) = bundled
        library = Path(wheel.extract(member, tmp_path))
    elif sys.platform.startswith("linux") and ctypes.util.find_library("gmp"):
        library = Path(ctypes.util.find_library("gmp"))  # an unrepaired wheel uses the system's libgmp
    else:
        _unavailable("no libgmp to compare the recorded version with")
    if sys.platform.startswith("linux"):
        # in a child process: the test process keeps its own (or no) libgmp
        reported = subprocess.run(
            [sys.executable, "-c", "import ctypes, sys; print(ctypes.c_char_p.in_dll("
             "ctypes.CDLL(sys.argv[1]), '__gmp_version').value.decode())", str(library)],
            capture_output=True, text=True, check=True).stdout.strip()
        assert reported == recorded.group(1)


def test_sdist_carries_the_licence_folder(dists):
    if dists["sdist"] is None:  # a plain skip also under CI=true: .ci/run stage 2 runs it on the built sdist
        pytest.skip("no sdist given (AMALGEBRA_TEST_DIST_DIR; .ci/run stage 2 sets it)")
    names = {n.split("/", 1)[1] for n in tarfile.open(dists["sdist"]).getnames() if "/" in n}
    assert {"LICENSE", *LICENCE_FILES} <= names


def test_installed_distribution_carries_the_licences_and_its_gmp_record():
    """The installed package, when it is not the source tree itself (``.ci/run`` stages 3 and 4 and
    cibuildwheel's test of every release wheel run this with the wheel or the sdist installed)."""
    import importlib.metadata

    import amalgebra

    package = Path(amalgebra.__file__).resolve().parent
    if package.is_relative_to(ROOT):  # a plain skip also under CI=true: stages 3-4 and cibuildwheel run it
        pytest.skip("amalgebra is imported from the source tree (editable install), not from a distribution")
    dist = importlib.metadata.distribution("amalgebra")
    installed = {str(f) for f in dist.files or ()}
    for name in ["LICENSE", *LICENCE_FILES]:
        matches = [f for f in installed if f.endswith(f".dist-info/licenses/{name}")]
        assert matches and dist.locate_file(matches[0]).is_file(), name
    try:
        from amalgebra.coupling import _racah6j
    except ImportError:
        return  # installed without the compiled kernel: no GMP inside, nothing more to record
    record = (Path(_racah6j.__file__).parent / "GMP-VERSION.txt").read_text(encoding="utf-8")
    recorded = re.match(r"GNU MP (\d+\.\d+\.\d+)\n", record)
    assert recorded, record
    if sys.platform.startswith("linux"):  # the libgmp the extension loaded reports the recorded version
        with open("/proc/self/maps", encoding="ascii", errors="replace") as maps:
            mapped = sorted({line.split()[-1] for line in maps if "libgmp" in line and "/" in line})
        assert mapped
        reported = {ctypes.c_char_p.in_dll(ctypes.CDLL(path), "__gmp_version").value.decode() for path in mapped}
        assert reported == {recorded.group(1)}
