//! Dense row-major matrices over a field's element type.

use crate::scalar::Field;

/// A dense `rows x cols` matrix stored row-major. Invariant: `data.len() == rows * cols`.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Matrix<E> {
    pub rows: usize,
    pub cols: usize,
    pub data: Vec<E>,
}

impl<E: Clone> Matrix<E> {
    /// A matrix with every entry equal to `fill`.
    pub fn filled(rows: usize, cols: usize, fill: E) -> Self {
        Matrix {
            rows,
            cols,
            data: vec![fill; rows * cols],
        }
    }

    /// The zero matrix of a field.
    pub fn zeros<F: Field<Elem = E>>(f: &F, rows: usize, cols: usize) -> Self {
        Self::filled(rows, cols, f.zero())
    }

    /// The identity matrix of a field.
    pub fn identity<F: Field<Elem = E>>(f: &F, n: usize) -> Self {
        let mut m = Self::zeros(f, n, n);
        for i in 0..n {
            m[(i, i)] = f.one();
        }
        m
    }

    /// Build from rows (all of equal length; `cols` is used when `rows` is empty).
    pub fn from_rows(rows: Vec<Vec<E>>, cols: usize) -> Self {
        let r = rows.len();
        let c = rows.first().map_or(cols, |x| x.len());
        let data: Vec<E> = rows.into_iter().flatten().collect();
        assert_eq!(data.len(), r * c, "rows of unequal length");
        Matrix {
            rows: r,
            cols: c,
            data,
        }
    }

    /// Row `i` as a slice.
    pub fn row(&self, i: usize) -> &[E] {
        &self.data[i * self.cols..(i + 1) * self.cols]
    }

    /// Row `i` as a mutable slice.
    pub fn row_mut(&mut self, i: usize) -> &mut [E] {
        &mut self.data[i * self.cols..(i + 1) * self.cols]
    }

    /// Column `j` copied out.
    pub fn column(&self, j: usize) -> Vec<E> {
        (0..self.rows).map(|i| self[(i, j)].clone()).collect()
    }

    /// Rows as vectors.
    pub fn to_rows(&self) -> Vec<Vec<E>> {
        (0..self.rows).map(|i| self.row(i).to_vec()).collect()
    }

    /// The transpose.
    pub fn transpose(&self) -> Self {
        let mut data = Vec::with_capacity(self.data.len());
        for j in 0..self.cols {
            for i in 0..self.rows {
                data.push(self[(i, j)].clone());
            }
        }
        Matrix {
            rows: self.cols,
            cols: self.rows,
            data,
        }
    }

    /// Map every entry (e.g. into another field).
    pub fn map<T>(&self, g: impl Fn(&E) -> T) -> Matrix<T> {
        Matrix {
            rows: self.rows,
            cols: self.cols,
            data: self.data.iter().map(g).collect(),
        }
    }

    /// The product `self * other`. Cost: O(r k c) field operations (zero entries skipped).
    pub fn mul<F: Field<Elem = E>>(&self, f: &F, other: &Matrix<E>) -> Matrix<E> {
        assert_eq!(
            self.cols, other.rows,
            "matrix product of incompatible shapes"
        );
        let mut out = Matrix::zeros(f, self.rows, other.cols);
        for i in 0..self.rows {
            for k in 0..self.cols {
                let a = &self[(i, k)];
                if f.is_zero(a) {
                    continue;
                }
                for j in 0..other.cols {
                    let b = &other.data[k * other.cols + j];
                    let o = &mut out.data[i * other.cols + j];
                    f.add_mul_assign(o, a, b);
                }
            }
        }
        out
    }

    /// The product with a column vector.
    pub fn mul_vec<F: Field<Elem = E>>(&self, f: &F, v: &[E]) -> Vec<E> {
        assert_eq!(self.cols, v.len());
        (0..self.rows)
            .map(|i| {
                let mut s = f.zero();
                for (a, b) in self.row(i).iter().zip(v) {
                    f.add_mul_assign(&mut s, a, b);
                }
                s
            })
            .collect()
    }

    /// True when every entry is zero.
    pub fn is_zero<F: Field<Elem = E>>(&self, f: &F) -> bool {
        self.data.iter().all(|x| f.is_zero(x))
    }
}

impl<E> std::ops::Index<(usize, usize)> for Matrix<E> {
    type Output = E;
    fn index(&self, (i, j): (usize, usize)) -> &E {
        &self.data[i * self.cols + j]
    }
}

impl<E> std::ops::IndexMut<(usize, usize)> for Matrix<E> {
    fn index_mut(&mut self, (i, j): (usize, usize)) -> &mut E {
        &mut self.data[i * self.cols + j]
    }
}
