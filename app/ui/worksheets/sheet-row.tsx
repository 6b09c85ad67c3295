/** One labelled line of a worksheet facts table. */
export function Row({ label, children }: { readonly label: string; readonly children: React.ReactNode }) {
  return (
    <tr>
      <th scope="row">{label}</th>
      <td>{children}</td>
    </tr>
  );
}
