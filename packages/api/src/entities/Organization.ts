import { Column, CreateDateColumn, Entity, PrimaryGeneratedColumn } from 'typeorm';

/** The team a deployment serves; users and projects belong to one. */
@Entity({ name: 'organizations' })
export class Organization {
  @PrimaryGeneratedColumn({ type: 'int', unsigned: true })
  id: number;

  @Column({ type: 'varchar', length: 200 })
  name: string;

  @CreateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)' })
  createdAt: Date;
}
