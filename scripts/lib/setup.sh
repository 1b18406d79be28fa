# Shared set-up for scripts/demo and scripts/test (sourced, not run).
# Installs the Debian 12 packages colchem needs when any is missing (with sudo when not
# root), then configures and builds into the given directory.

COLCHEM_DEBIAN_PACKAGES=(
  g++ cmake make pkg-config git
  petsc-dev libopenmpi-dev openmpi-bin
  libnetcdf-dev netcdf-bin
  libyaml-cpp-dev libspdlog-dev libfmt-dev catch2 libcli11-dev libudunits2-dev
  python3 python3-numpy python3-xarray python3-netcdf4 python3-matplotlib python3-pint
  cdo nco
)

colchem_install_missing() {
  local missing=()
  local p
  for p in "${COLCHEM_DEBIAN_PACKAGES[@]}"; do
    if ! dpkg-query -W -f='${Status}' "$p" 2>/dev/null | grep -q "install ok installed"; then
      missing+=("$p")
    fi
  done
  if [ ${#missing[@]} -eq 0 ]; then
    return 0
  fi
  echo "colchem: installing missing Debian packages: ${missing[*]}"
  local sudo=""
  if [ "$(id -u)" -ne 0 ]; then
    command -v sudo >/dev/null 2>&1 || { echo "colchem: need root or sudo to install ${missing[*]}" >&2; return 1; }
    sudo="sudo"
  fi
  $sudo apt-get update -qq
  DEBIAN_FRONTEND=noninteractive $sudo apt-get install -y -qq --no-install-recommends "${missing[@]}"
  colchem_pin_reference_blas "$sudo"
}

# cdo pulls in OpenBLAS, whose higher alternatives priority would switch libblas/liblapack
# away from the reference implementation the tests were set up with (issue 10,
# cli.pyrene_blas); select the reference libraries again when they are installed.
colchem_pin_reference_blas() {
  local sudo=$1
  local arch name lib
  arch=$(dpkg-architecture -qDEB_HOST_MULTIARCH 2>/dev/null || echo x86_64-linux-gnu)
  for name in blas lapack; do
    lib=/usr/lib/$arch/$name/lib$name.so.3
    if [ -e "$lib" ]; then
      $sudo update-alternatives --set "lib$name.so.3-$arch" "$lib" >/dev/null
    fi
  done
}

# colchem_build BUILD_DIR [extra cmake args...]
colchem_build() {
  local dir=$1; shift
  local jobs
  jobs=$(nproc 2>/dev/null || echo 2)
  cmake -S "$COLCHEM_ROOT" -B "$dir" -DCMAKE_BUILD_TYPE=Release "$@" >/dev/null
  cmake --build "$dir" -j "$jobs"
}

# OpenMPI refuses to start as root unless told; CI and these machines run as root.
export OMPI_ALLOW_RUN_AS_ROOT=1
export OMPI_ALLOW_RUN_AS_ROOT_CONFIRM=1
# Debian's python3-* packages serve Debian's own interpreter, not one a version manager
# puts first on PATH.
export COLCHEM_PYTHON=/usr/bin/python3
